import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { POST as createCase } from '@/app/api/workspaces/[workspace]/cases/route';
import { GET as getCase, PATCH as patchCase } from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import { GET as getProgramme } from '@/app/api/workspaces/[workspace]/cases/[id]/programme/route';
import type { ProgrammeDto } from '@/lib/cases/programme-types';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('the fleet programme route on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let users: Record<string, number> = {};
  let caseId: number;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    users = await userIds(k);
    const wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    const setId = (await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id')).id;
    const trucks = await k('trucks').where({ workspaceId: wsId }).orderBy('unitNumber').limit(8).select('id');
    signInAs(users['analyst@aldervane.test']);
    const r = await call(createCase, { workspace: WS }, { body: { name: 'Programme', assumptionSetId: setId, selection: trucks.map((t) => ({ truckId: t.id, repowerOfferId: null })) } });
    expect(r.status).toBe(201);
    caseId = r.body.case.id;
  });
  afterAll(async () => destroy());

  const programme = async () => {
    const r = await call(getProgramme, { workspace: WS, id: String(caseId) });
    expect(r.status).toBe(200);
    return r.body as ProgrammeDto;
  };
  const savePlan = async (plan: Record<string, unknown>) => {
    const row = (await call(getCase, { workspace: WS, id: String(caseId) })).body.case;
    return call(patchCase, { workspace: WS, id: String(caseId) }, { method: 'PATCH', body: { version: row.version, plan: { ...row.plan, ...plan } } });
  };

  it('answers every truck with one chosen timing, its alternatives and an optimal status, readable by a viewer', async () => {
    signInAs(users['viewer@aldervane.test']);
    const p = await programme();
    expect(p.ok).toBe(true);
    expect(p.status).toMatch(/optimal/i);
    expect(p.trucks).toHaveLength(8);
    for (const t of p.trucks) {
      expect(t.rowId).toBeGreaterThan(0);
      expect(t.alternatives.map((a) => a.key)).not.toContain(t.chosen.key);
      // without budgets, with room in the shop each truck takes its best option
      expect(t.cost).toBeCloseTo(0, 6);
      expect(t.chosen.npv).toBe(t.best.npv);
    }
    // Σ chosen npv less Σ rebuild npv
    const rebuild = p.trucks.reduce((s, t) => s + [t.chosen, ...t.alternatives].find((o) => o.kind === 'rebuild')!.npv, 0);
    expect(p.gainVsRebuild).toBeCloseTo(p.objective - rebuild, 6);
    expect(p.months.every((m) => m.capacity === p.settings.swapsPerMonth)).toBe(true);
  });

  it('plans no swap in a shutdown month and keeps planned capital within each budget', async () => {
    signInAs(users['analyst@aldervane.test']);
    const before = await programme();
    const busy = before.months.find((m) => m.used > 0)!;
    const withSwap = before.periods.find((x) => x.plannedCapital > 0)!;
    const budget = Math.floor(withSwap.plannedCapital / 2);
    const saved = await savePlan({ capacityByMonth: { [String(busy.month)]: 0 }, budgets: { [String(withSwap.period)]: budget } });
    expect(saved.status).toBe(200);
    const p = await programme();
    expect(p.ok).toBe(true);
    expect(p.months[busy.month]).toMatchObject({ capacity: 0, used: 0, shutdown: true });
    expect(p.trucks.every((t) => t.chosen.month !== busy.month)).toBe(true);
    expect(p.periods[withSwap.period].budget).toBe(budget);
    expect(p.periods[withSwap.period].plannedCapital).toBeLessThanOrEqual(budget + 1e-6);
    // the halved budget binds, and its +1 M is reported in plain money (≥ 0)
    const b = p.binding.find((x) => x.kind === 'budget' && x.index === withSwap.period);
    if (b) {
      expect(b.relaxBy).toBe(1_000_000);
      expect(b.gain).toBeGreaterThanOrEqual(0);
      expect(b.label).toBe(p.periods[withSwap.period].label);
    }
    // the constraints cost something: the fleet is worse off than unconstrained
    expect(p.objective).toBeLessThanOrEqual(before.objective + 1e-6);
  });

  it('refuses a capacity month outside 0–239, a negative capacity and a delay over 12 months, saving nothing', async () => {
    signInAs(users['analyst@aldervane.test']);
    const row = (await call(getCase, { workspace: WS, id: String(caseId) })).body.case;
    for (const plan of [{ capacityByMonth: { '240': 1 } }, { capacityByMonth: { '3': -1 } }, { maxDelayMonths: 13 }]) {
      const r = await savePlan(plan);
      expect(r.status).toBe(422);
      expect(JSON.stringify(r.body)).toMatch(/plan/);
    }
    expect((await call(getCase, { workspace: WS, id: String(caseId) })).body.case.version).toBe(row.version);
  });

  it('answers 404 for a case of no such id', async () => {
    signInAs(users['viewer@aldervane.test']);
    expect((await call(getProgramme, { workspace: WS, id: '999999' })).status).toBe(404);
  });
});
