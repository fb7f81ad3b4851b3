/**
 * Issue 20, re-forecast: from the approved demo case, a new draft whose trucks
 * carry the figures their readings give. One truck's readings are replaced by
 * the worked example of lib/readings/derive.ts (worked by hand below), one
 * truck's are removed (kept as the case had it), and T3-14's recorded repower
 * changes its engine type.
 */
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { GET as getPreview, POST as postReforecast } from '@/app/api/workspaces/[workspace]/cases/[id]/reforecast/route';
import { GET as getResult } from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import { POST as copyCase } from '@/app/api/workspaces/[workspace]/cases/[id]/copy/route';
import { POST as submitCase } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { setOutboxKicksForTests } from '@/lib/mail/queue';
import { deriveFigures } from '@/lib/readings/derive';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { OTHER, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

/** Set to make the audit write of a re-forecast fail (the transaction must then leave nothing). */
const failing = vi.hoisted(() => ({ audit: false }));
vi.mock('@/lib/audit', async (importOriginal) => {
  const actual = await importOriginal<typeof import('@/lib/audit')>();
  return {
    ...actual,
    writeAudit: async (...args: Parameters<typeof actual.writeAudit>) => {
      if (failing.audit && args[1].action === 'reforecast') throw new Error('the audit store is down (test)');
      return actual.writeAudit(...args);
    },
  };
});

/**
 * derive.ts's worked example, window 12 (no reading 12 months before 2026-03,
 * so the first reading is the baseline and the window is 3 months):
 * H = 500 + 450 + 550 = 1,500 h; annual = 1,500 × 12 / 3 = 6,000 h;
 * burn = (100,000 + 90,000 + 110,000) / 1,500 = 200 L/h;
 * engine hours = 11,500 − 10,500 = 1,000 h since the overhaul of 2026-02.
 */
const EXAMPLE = [
  { month: '2025-12', hourMeter: 10_000, fuelLitres: 250_000, overhauls: 0 },
  { month: '2026-01', hourMeter: 10_500, fuelLitres: 100_000, overhauls: 0 },
  { month: '2026-02', hourMeter: 10_950, fuelLitres: 90_000, overhauls: 1 },
  { month: '2026-03', hourMeter: 11_500, fuelLitres: 110_000, overhauls: 0 },
];

type Truck = { unitNumber: string; truckId: number; case: Record<string, unknown>; fromReadings: Record<string, any> | null; next: Record<string, unknown>; changes: string[]; note: string };

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('re-forecast on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;
  let approvedId: number;
  let draftId: number;
  const truck: Record<string, number> = {};

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    approvedId = (await k('business_cases').where({ workspaceId: wsId, status: 'approved' }).first('id')).id;
    draftId = (await k('business_cases').where({ workspaceId: wsId, status: 'draft' }).first('id')).id;
    for (const u of ['T3-03', 'T3-04', 'T3-05', 'T3-14']) truck[u] = (await k('trucks').where({ workspaceId: wsId, unitNumber: u }).first('id')).id;
    await k('truck_readings').whereIn('truckId', [truck['T3-03'], truck['T3-05']]).delete();
    const now = new Date().toISOString();
    await k('truck_readings').insert(EXAMPLE.map((r) => ({ workspaceId: wsId, truckId: truck['T3-05'], ...r, failures: 0, daysDown: 0, notes: '', version: 1, createdAt: now, updatedAt: now })));
  });
  afterAll(async () => {
    setOutboxKicksForTests('background');
    await destroy();
  });

  const preview = async (query = '') => call(getPreview, { workspace: WS, id: String(approvedId) }, { url: `http://127.0.0.1/api/test${query}` });
  const byUnit = (body: { trucks: Truck[] }, unit: string) => body.trucks.find((t) => t.unitNumber === unit)!;

  it('previews each truck: the case figure, the figure from readings with its date and window, and what changes', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const r = await preview();
    expect(r.status).toBe(200);
    expect(r.body.windowMonths).toBe(12);
    expect(r.body.lastReading).toBe('2026-11');
    expect(r.body.planStartMonth).toEqual({ current: '2024-12', next: '2026-12' });

    const t5 = byUnit(r.body, 'T3-05');
    // the approved case's figures are the demo register's (scenarios/aldervane-north-pit.json)
    expect(t5.case).toEqual({ engineHours: 7200, annualHours: 6150, fuelBurnLitresPerHour: 348.3, engineKey: 'ac-2600-legacy' });
    // the hand-worked figures above
    expect(t5.fromReadings).toMatchObject({ asOf: '2026-03', engineHours: 1000, annualHours: 6000, fuelBurnLitresPerHour: 200 });
    expect(t5.fromReadings!.window).toEqual({ from: '2026-01', to: '2026-03', months: 3, askedMonths: 12, readings: 3 });
    expect(t5.fromReadings!.engineHoursBasis).toEqual({ value: 1000, basis: 'since-overhaul', since: '2026-02' });
    expect(t5.next).toEqual({ engineHours: 1000, annualHours: 6000, fuelBurnLitresPerHour: 200, engineKey: 'ac-2600-legacy' });
    expect(t5.changes).toEqual(['engineHours', 'annualHours', 'fuelBurnLitresPerHour']);
    // and derive.ts says the same of those readings
    const d = deriveFigures(EXAMPLE.map((e) => ({ ...e, repowerDate: null, repowerEngineTypeId: null })), 12)!;
    expect([d.engineHours.value, d.annualHours, d.fuelBurnLitresPerHour]).toEqual([t5.next.engineHours, t5.next.annualHours, t5.next.fuelBurnLitresPerHour]);

    // no readings: kept as the case had it, and said so
    const t3 = byUnit(r.body, 'T3-03');
    expect(t3.fromReadings).toBeNull();
    expect(t3.next).toEqual(t3.case);
    expect(t3.changes).toEqual([]);
    expect(t3.note).toBe('No readings: kept as the case had it.');
    expect(r.body.withoutReadings).toBe(1);

    // a truck without a measured burn keeps the engine's: the case does not use one
    const t4 = byUnit(r.body, 'T3-04');
    expect(t4.case.fuelBurnLitresPerHour).toBeNull();
    expect(typeof t4.fromReadings!.fuelBurnLitresPerHour).toBe('number');
    expect(t4.next.fuelBurnLitresPerHour).toBeNull();
    expect(t4.changes).not.toContain('fuelBurnLitresPerHour');

    // T3-14's repower of 2025-07 fitted the offer's engine: engine type and engine hours since the repower
    const t14 = byUnit(r.body, 'T3-14');
    expect(t14.fromReadings!.repower).toMatchObject({ month: '2025-07', date: '2025-07-14' });
    expect(t14.next.engineKey).toBe('km-2700-bypass');
    expect(t14.changes).toContain('engine');
    expect(t14.fromReadings!.engineHoursBasis.basis).toBe('since-repower');
    expect(t14.note).toContain('repowered on 2025-07-14');
  });

  it('a shorter window changes the window, not the rule', async () => {
    const r = await preview('?window=2');
    expect(r.status).toBe(200);
    // baseline 2026-01 (two months before 2026-03): H = 450 + 550 = 1,000 h, annual 1,000 × 12 / 2 = 6,000 h, burn 200,000 / 1,000 = 200 L/h
    expect(byUnit(r.body, 'T3-05').fromReadings).toMatchObject({ annualHours: 6000, fuelBurnLitresPerHour: 200, window: { from: '2026-02', to: '2026-03', months: 2 } });
    const bad = await preview('?window=0');
    expect(bad.status).toBe(422);
    expect(bad.body.problems[0].path).toBe('window');
  });

  it('POST starts a draft whose trucks carry the derived figures, its plan from the month after the last reading, with its audit row', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const before = await k('trucks').where({ id: truck['T3-05'] }).first();
    const r = await call(postReforecast, { workspace: WS, id: String(approvedId) }, { body: {} });
    expect(r.status).toBe(201);
    const id = r.body.case.id as number;
    expect(r.body.case.name).toBe('North Pit 300 t repower programme (approved 2024-11) — re-forecast 2026-11');
    const row = await k('business_cases').where({ id }).first();
    expect(row.status).toBe('draft');
    expect(JSON.parse(row.plan).startMonth).toBe('2026-12');
    expect(JSON.parse(row.selection)).toEqual(JSON.parse((await k('business_cases').where({ id: approvedId }).first('selection')).selection));

    // the new case evaluates with the figures from readings; the register is unchanged
    const result = await call(getResult, { workspace: WS, id: String(id) });
    expect(result.status).toBe(200);
    expect(result.body.trucks['T3-05']).toMatchObject({ engineHours: 1000, annualHours: 6000, engineId: 'ac-2600-legacy' });
    expect(result.body.trucks['T3-14'].engineId).toBe('km-2700-bypass');
    expect(result.body.trucks['T3-03']).toMatchObject({ engineHours: 4100, annualHours: 5750 });
    expect(await k('trucks').where({ id: truck['T3-05'] }).first()).toEqual(before);

    const audit = await k('audit_log').where({ workspaceId: wsId, entity: 'business_case', entityId: String(id) });
    expect(audit.map((a) => a.action)).toEqual(['reforecast']);
    expect(audit[0].userId).toBe(ids['analyst@aldervane.test']);
    expect(JSON.parse(audit[0].before)).toEqual({ reforecastOf: approvedId, windowMonths: 12, readingsTo: '2026-11' });
    expect(JSON.parse(audit[0].after).truckFigures['T3-05']).toMatchObject({ engineHours: 1000, annualHours: 6000, fuelBurnLitresPerHour: 200, source: 'readings to 2026-03' });
    expect(JSON.parse(audit[0].after).truckFigures['T3-03'].source).toBe('kept (no readings)');
  });

  it('a copy of the re-forecast draft keeps its figures, and its submission snapshot holds them', async () => {
    signInAs(ids['analyst@aldervane.test']);
    setOutboxKicksForTests('off');
    const id = (await k('business_cases').where({ workspaceId: wsId }).where('name', 'like', '% — re-forecast 2026-11').first('id')).id as number;
    const copy = await call(copyCase, { workspace: WS, id: String(id) }, { body: {} });
    expect(copy.status).toBe(201);
    const copied = await call(getResult, { workspace: WS, id: String(copy.body.case.id) });
    expect(copied.body.trucks['T3-05']).toMatchObject({ engineHours: 1000, annualHours: 6000 });
    const version = (await k('business_cases').where({ id }).first('version')).version;
    const submitted = await call(submitCase, { workspace: WS, id: String(id) }, { body: { comment: 'Re-forecast from readings.', version } });
    expect(submitted.status).toBe(200);
    const snapshot = JSON.parse((await k('business_cases').where({ id }).first('submittedCase')).submittedCase);
    const t5 = snapshot.trucks.find((t: { id: string }) => t.id === 'T3-05');
    expect(t5).toMatchObject({ engineHours: 1000, annualHours: 6000, fuelBurnLitresPerHour: 200, engineId: 'ac-2600-legacy' });
    expect(snapshot.trucks.find((t: { id: string }) => t.id === 'T3-14').engineId).toBe('km-2700-bypass');
    expect(snapshot.engines.map((e: { id: string }) => e.id)).toContain('km-2700-bypass');
  });

  it('refuses a case that is not approved with 409, and saves nothing', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const count = async () => Number((await k('business_cases').count<{ n: number }[]>({ n: '*' }))[0].n);
    const n = await count();
    const get = await call(getPreview, { workspace: WS, id: String(draftId) });
    expect(get.status).toBe(409);
    expect(get.body.error).toMatch(/^This case is draft; only an approved case can be re-forecast/);
    const post = await call(postReforecast, { workspace: WS, id: String(draftId) }, { body: {} });
    expect(post.status).toBe(409);
    expect(await count()).toBe(n);
    expect((await call(postReforecast, { workspace: WS, id: '999999' }, { body: {} })).status).toBe(404);
  });

  it('leaves nothing half-saved when the transaction fails', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const cases = async () => (await k('business_cases').where({ workspaceId: wsId }).orderBy('id')).map((c) => c.id);
    const audit = async () => Number((await k('audit_log').where({ workspaceId: wsId }).count<{ n: number }[]>({ n: '*' }))[0].n);
    const [c0, a0] = [await cases(), await audit()];
    failing.audit = true;
    try {
      const r = await call(postReforecast, { workspace: WS, id: String(approvedId) }, { body: { name: 'Should not exist' } });
      expect(r.status).toBe(500);
    } finally {
      failing.audit = false;
    }
    expect(await cases()).toEqual(c0);
    expect(await audit()).toBe(a0);
    expect(await k('business_cases').where({ name: 'Should not exist' }).first()).toBeUndefined();
  });

  it('is for whoever may create cases: viewers and approvers 403, another workspace not found, signed out 401; a bad name is 422', async () => {
    for (const who of ['viewer@aldervane.test', 'approver@aldervane.test']) {
      signInAs(ids[who]);
      expect((await preview()).status).toBe(403);
      expect((await call(postReforecast, { workspace: WS, id: String(approvedId) }, { body: {} })).status).toBe(403);
    }
    // another workspace's case is not found there; a workspace where one only views is closed
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(getPreview, { workspace: OTHER, id: String(approvedId) })).status).toBe(404);
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(getPreview, { workspace: OTHER, id: String(approvedId) })).status).toBe(403);
    signInAs(ids['analyst@aldervane.test']);
    const bad = await call(postReforecast, { workspace: WS, id: String(approvedId) }, { body: { name: '=cmd', windowMonths: 61 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['name', 'windowMonths']);
    signInAs(null);
    expect((await preview()).status).toBe(401);
  });
});
