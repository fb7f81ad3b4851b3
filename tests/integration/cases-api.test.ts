import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { evaluateCase } from '@/lib/engine';
import { GET as listCases, POST as createCase } from '@/app/api/workspaces/[workspace]/cases/route';
import { DELETE as deleteCase, GET as getCase, PATCH as patchCase } from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import { POST as copyCase } from '@/app/api/workspaces/[workspace]/cases/[id]/copy/route';
import { GET as getResult } from '@/app/api/workspaces/[workspace]/cases/[id]/result/route';
import { GET as getProgramme } from '@/app/api/workspaces/[workspace]/cases/[id]/programme/route';
import { GET as getTruck } from '@/app/api/workspaces/[workspace]/cases/[id]/trucks/[truckId]/route';
import { GET as getOptions } from '@/app/api/workspaces/[workspace]/cases/options/route';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('business cases API on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let users: Record<string, number> = {};
  let wsId: number;
  let baseSetId: number;
  let truckRows: Array<{ id: number; unitNumber: string }>;
  let caseId: number;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    users = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    baseSetId = (await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id')).id;
    truckRows = await k('trucks').where({ workspaceId: wsId }).orderBy('unitNumber').select('id', 'unitNumber');
  });
  afterAll(async () => destroy());

  const as = (who: string) => signInAs(users[`${who}@aldervane.test`]);
  const allTrucks = () => truckRows.map((t) => ({ truckId: t.id, repowerOfferId: null }));

  it('answers 401 signed out and 403 to a viewer who tries to create', async () => {
    signInAs(null);
    expect((await call(listCases, { workspace: WS })).status).toBe(401);
    as('viewer');
    const r = await call(createCase, { workspace: WS }, { body: { name: 'x', assumptionSetId: baseSetId, selection: allTrucks() } });
    expect(r.status).toBe(403);
  });

  it('lets an analyst create a case and audits it', async () => {
    as('analyst');
    const opts = await call(getOptions, { workspace: WS });
    expect(opts.body.trucks).toHaveLength(24);
    const r = await call(createCase, { workspace: WS }, { body: { name: 'Demo fleet, base', assumptionSetId: baseSetId, selection: allTrucks() } });
    expect(r.status).toBe(201);
    expect(r.body.case).toMatchObject({ name: 'Demo fleet, base', status: 'draft', version: 1, truckCount: 24, assumptionSetName: 'Base' });
    caseId = r.body.case.id;
    const audit = await k('audit_log').where({ entity: 'business_case', entityId: String(caseId), action: 'create' });
    expect(audit).toHaveLength(1);
    as('viewer');
    const list = await call(listCases, { workspace: WS });
    expect(list.body.cases.map((c: { id: number }) => c.id)).toContain(caseId);
  });

  it('refuses bad input with every problem and its path, saving nothing', async () => {
    as('analyst');
    const before = (await k('business_cases').count<{ n: number }[]>({ n: '*' }))[0].n;
    const r = await call(createCase, { workspace: WS }, { body: { name: ' ', assumptionSetId: 999999, selection: [{ truckId: truckRows[0].id, repowerOfferId: 424242 }, { truckId: 77777, repowerOfferId: null }] } });
    expect(r.status).toBe(422);
    expect(r.body.problems.map((p: { path: string }) => p.path)).toEqual(['name']);
    const r2 = await call(createCase, { workspace: WS }, { body: { name: 'ok', assumptionSetId: 999999, selection: [{ truckId: truckRows[0].id, repowerOfferId: 424242 }, { truckId: 77777, repowerOfferId: null }] } });
    expect(r2.status).toBe(422);
    expect(r2.body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['assumptionSetId', 'selection[0].repowerOfferId', 'selection[1].truckId']);
    expect((await call(createCase, { workspace: WS }, { body: '{not json' })).status).toBe(422);
    expect((await k('business_cases').count<{ n: number }[]>({ n: '*' }))[0].n).toBe(before);
  });

  it('evaluates on the server to the engine\'s own result for the demo scenario', async () => {
    as('viewer');
    const r = await call(getResult, { workspace: WS, id: String(caseId) });
    expect(r.status).toBe(200);
    const scenario = JSON.parse(fs.readFileSync(path.resolve('scenarios/aldervane-north-pit.json'), 'utf8'));
    const expected = evaluateCase(scenario);
    const byId = new Map(expected.trucks.map((t) => [t.id, t]));
    expect(r.body.result.format).toBe('case-result/1');
    expect(r.body.result.trucks).toHaveLength(24);
    for (const t of r.body.result.trucks) {
      const e = byId.get(t.id)!;
      expect(t.options.repower.npv).toBeCloseTo(e.options.repower.npv, 4);
      expect(t.repowerVsRebuild.deltaNpv).toBeCloseTo(e.repowerVsRebuild.deltaNpv, 4);
      expect(t.best).toBe(e.best);
    }
    expect(r.body.result.fleet.npv.best).toBeCloseTo(expected.fleet.npv.best, 2);
    // the valuation the figures are, and ΔNPV repower vs rebuild of the same case with every offer's productivity gain at 0
    expect(r.body.valuation).toBe('expected');
    const noGain = evaluateCase({ ...scenario, repowerOffers: scenario.repowerOffers.map((o: object) => ({ ...o, productivityGain: 0 })) });
    let fleetNoGain = 0;
    for (const t of noGain.trucks) {
      expect(r.body.withoutGain.trucks[t.id]).toBeCloseTo(t.repowerVsRebuild.deltaNpv, 4);
      fleetNoGain += t.repowerVsRebuild.deltaNpv;
    }
    expect(r.body.withoutGain.fleet).toBeCloseTo(fleetNoGain, 2);
    expect(r.body.withoutGain.anyGain).toBe(true);
    expect(r.body.summary.trucksByBest.repower + r.body.summary.trucksByBest.rebuild + r.body.summary.trucksByBest.keep).toBe(24);
    expect(r.body.ranking[0].rank).toBe(1);
    // no budgets: every paying repower is in the plan and on the schedule, at most 2 a month
    expect(r.body.schedule).toHaveLength(r.body.plan.years.reduce((s: number, y: { chosen: unknown[] }) => s + y.chosen.length, 0));
    const perMonth = new Map<number, number>();
    for (const s of r.body.schedule) perMonth.set(s.month, (perMonth.get(s.month) ?? 0) + 1);
    expect(Math.max(...perMonth.values())).toBeLessThanOrEqual(2);
    // the schedule is the fleet programme's: a swap at the next planned overhaul is due the month its engine reaches
    // its planned life, worked by hand from the scenario: t = life − hours, year p = ⌈t / A⌉,
    // month 12(p − 1) + ⌊12(t − (p − 1)A)/A⌋; planned d months late (the programme's choice) it falls in month
    // due + d, and its capital in the year holding t + d·A/12 hours (year 0 only for a swap now)
    for (const s of r.body.schedule) {
      const t = scenario.trucks.find((x: { id: string }) => x.id === s.truckId);
      const life = scenario.engines.find((e: { id: string }) => e.id === t.engineId).lifeHours;
      const toGo = Math.max(0, life - t.engineHours);
      const p = toGo <= 0 ? 0 : Math.ceil(toGo / t.annualHours);
      const month = p === 0 ? 0 : 12 * (p - 1) + Math.floor((12 * (toGo - (p - 1) * t.annualHours)) / t.annualHours);
      expect(s.dueMonth, s.truckId).toBe(month);
      const late = s.month - s.dueMonth;
      expect(late, s.truckId).toBeGreaterThanOrEqual(0);
      expect(s.late, s.truckId).toBe(late > 0);
      const at = toGo + (late * t.annualHours) / 12;
      expect(s.capitalYear, s.truckId).toBe(at <= 0 ? 0 : Math.ceil(at / t.annualHours - 1e-9));
    }
    expect(r.body.schedule.some((s: { capitalYear: number }) => s.capitalYear >= 2)).toBe(true);
    const truck = await call(getTruck, { workspace: WS, id: String(caseId), truckId: 'T3-01' });
    expect(truck.status).toBe(200);
    expect(truck.body.detail.policies.repower.periods.length).toBe(truck.body.result.horizonYears + 1);
    expect(truck.body.valuation).toBe('expected');
    expect(Object.keys(truck.body.withoutGain.trucks)).toEqual(['T3-01']);
    expect(truck.body.withoutGain.fleet).toBeCloseTo(r.body.withoutGain.trucks['T3-01'], 6);
    expect((await call(getTruck, { workspace: WS, id: String(caseId), truckId: 'NOPE' })).status).toBe(404);
  });

  it('opens the truck whose unit number the route names, "%" and all, and answers 404 (not 500) for a unit no truck has', async () => {
    as('viewer');
    // Next passes the segment decoded once: the link /trucks/T%2541 arrives as "T%41"
    const [a, b, c] = truckRows.slice(1, 4);
    await k('trucks').where({ id: a.id }).update({ unitNumber: 'T%41' });
    await k('trucks').where({ id: b.id }).update({ unitNumber: 'TA' });
    await k('trucks').where({ id: c.id }).update({ unitNumber: '50%' });
    try {
      const truck = (truckId: string) => call(getTruck, { workspace: WS, id: String(caseId), truckId });
      const pct = await truck('T%41');
      expect(pct.status).toBe(200);
      expect(pct.body.result.id).toBe('T%41');
      expect((await truck('TA')).body.result.id).toBe('TA');
      const fifty = await truck('50%');
      expect(fifty.status).toBe(200);
      expect(fifty.body.result.id).toBe('50%');
      expect((await truck('%E0%A4%A')).status).toBe(404);
      expect((await truck('T%')).status).toBe(404);
      expect((await truck('x'.repeat(200))).status).toBe(404);
    } finally {
      for (const t of [a, b, c]) await k('trucks').where({ id: t.id }).update({ unitNumber: t.unitNumber });
    }
  });

  it('saves budgets with the version, answers 409 to a stale one, and plans within the budget', async () => {
    as('analyst');
    // one module costs about 2.5 M: a 1 M budget in year 0 leaves the truck due now out
    const plan = { budgets: { '0': 1_000_000, '1': 2_000_000 }, swapsPerMonth: 1, startMonth: '2027-01' };
    const ok = await call(patchCase, { workspace: WS, id: String(caseId) }, { method: 'PATCH', body: { version: 1, plan } });
    expect(ok.status).toBe(200);
    expect(ok.body.case.version).toBe(2);
    const stale = await call(patchCase, { workspace: WS, id: String(caseId) }, { method: 'PATCH', body: { version: 1, name: 'late' } });
    expect(stale.status).toBe(409);
    const r = await call(getResult, { workspace: WS, id: String(caseId) });
    for (const y of r.body.plan.years) if (y.budget !== null) expect(y.spent).toBeLessThanOrEqual(y.budget);
    // most modules cost about 2.5 M: the small budgets of years 0–1 hold at most one swap, so trucks whose best
    // timing spends there are left out or moved to a later timing, at a cost the programme reports
    const prog = await call(getProgramme, { workspace: WS, id: String(caseId) });
    type T = { best: { key: string; capitalPeriod: number | null }; chosen: { key: string }; cost: number };
    const pushed = prog.body.trucks.filter((t: T) => t.best.capitalPeriod !== null && t.best.capitalPeriod <= 1 && t.chosen.key !== t.best.key);
    expect(pushed.length).toBeGreaterThan(0);
    for (const t of pushed) expect(t.cost).toBeGreaterThan(0);
    // the proposal is the programme's answer: the same trucks swap, in the same months
    const swapped = prog.body.trucks.filter((t: { chosen: { month: number | null; kind: string } }) => t.chosen.month !== null && t.chosen.kind !== 'keep' && t.chosen.kind !== 'rebuild');
    expect(r.body.schedule.map((s: { truckId: string; month: number }) => `${s.truckId}@${s.month}`).sort()).toEqual(swapped.map((t: { truckId: string; chosen: { month: number } }) => `${t.truckId}@${t.chosen.month}`).sort());
    expect(r.body.proposal.gainVsRebuildAll).toBeCloseTo(prog.body.gainVsRebuild, 2);
    // one swap a month at most
    const months = r.body.schedule.map((s: { month: number }) => s.month);
    expect(new Set(months).size).toBe(months.length);
    expect((await k('audit_log').where({ entity: 'business_case', entityId: String(caseId), action: 'update-plan' })).length).toBe(1);
    const bad = await call(patchCase, { workspace: WS, id: String(caseId) }, { method: 'PATCH', body: { version: 2, plan: { ...plan, budgets: { '1': -5 }, swapsPerMonth: 0 } } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['plan.budgets.1', 'plan.swapsPerMonth']);
  });

  it('shows the problems of a case that cannot be evaluated (a truck without an offer)', async () => {
    as('analyst');
    const t = truckRows[0];
    await k('trucks').where({ id: t.id }).update({ repowerOfferId: null });
    const r = await call(getResult, { workspace: WS, id: String(caseId) });
    expect(r.status).toBe(422);
    expect(r.body.problems.some((p: { path: string; message: string }) => p.path.includes(t.unitNumber) && /repower offer/.test(p.message))).toBe(true);
    const offer = await k('repower_offers').where({ workspaceId: wsId }).first('id');
    await k('trucks').where({ id: t.id }).update({ repowerOfferId: offer.id });
  });

  it('lets a case sent back for changes be edited again', async () => {
    as('analyst');
    const copy = await call(copyCase, { workspace: WS, id: String(caseId) }, { method: 'POST' });
    const id = String(copy.body.case.id);
    await k('business_cases').where({ id: Number(id) }).update({ status: 'returned' });
    const renamed = await call(patchCase, { workspace: WS, id }, { method: 'PATCH', body: { version: 1, name: 'Fixed after review' } });
    expect(renamed.status).toBe(200);
    expect(renamed.body.case.name).toBe('Fixed after review');
  });

  it('serves an approved case from its frozen record, whatever the fleet says today', async () => {
    as('analyst');
    const copy = await call(copyCase, { workspace: WS, id: String(caseId) }, { method: 'POST' });
    const id = Number(copy.body.case.id);
    const live = await call(getResult, { workspace: WS, id: String(id) });
    expect(live.status).toBe(200);
    const frozen = JSON.parse(fs.readFileSync(path.resolve('scenarios/one-truck.json'), 'utf8'));
    await k('business_cases').where({ id }).update({ status: 'approved', frozenCase: JSON.stringify(frozen) });
    const r = await call(getResult, { workspace: WS, id: String(id) });
    expect(r.status).toBe(200);
    // the route leaves each policy's by-year breakdown out (the truck route has the per-period detail)
    const engine = evaluateCase(frozen);
    const slim = { ...engine, trucks: engine.trucks.map((t) => ({ ...t, options: Object.fromEntries(Object.entries(t.options).map(([p, o]) => [p, (({ breakdown: _b, ...rest }) => rest)(o)])) })) };
    expect(r.body.result).toEqual(slim);
    expect(r.body.result.trucks.map((t: { id: string }) => t.id)).toEqual(['T-01']);
    // and it cannot be changed
    expect((await call(patchCase, { workspace: WS, id: String(id) }, { method: 'PATCH', body: { version: 1, name: 'x' } })).status).toBe(409);
  });

  it('copies, renames and deletes; a case that is not a draft cannot be changed', async () => {
    as('analyst');
    const copy = await call(copyCase, { workspace: WS, id: String(caseId) }, { method: 'POST' });
    expect(copy.status).toBe(201);
    expect(copy.body.case.name).toMatch(/\(copy\)$/);
    const id = String(copy.body.case.id);
    const renamed = await call(patchCase, { workspace: WS, id }, { method: 'PATCH', body: { version: 1, name: 'Renamed' } });
    expect(renamed.body.case).toMatchObject({ name: 'Renamed', version: 2 });
    await k('business_cases').where({ id: Number(id) }).update({ status: 'submitted' });
    const locked = await call(patchCase, { workspace: WS, id }, { method: 'PATCH', body: { version: 2, name: 'x' } });
    expect(locked.status).toBe(409);
    expect(locked.body.error).toMatch(/only a draft/);
    await k('business_cases').where({ id: Number(id) }).update({ status: 'draft' });
    for (const url of ['http://x/a', 'http://x/a?version=abc', 'http://x/a?version=2.5']) {
      const r = await call(deleteCase, { workspace: WS, id }, { method: 'DELETE', url });
      expect(r.status, url).toBe(422);
      expect(r.body.problems.map((p: { path: string }) => p.path)).toEqual(['version']);
    }
    expect((await call(deleteCase, { workspace: WS, id }, { method: 'DELETE', url: 'http://x/a?version=1' })).status).toBe(409);
    expect((await call(deleteCase, { workspace: WS, id }, { method: 'DELETE', url: 'http://x/a?version=2' })).status).toBe(204);
    expect((await call(getCase, { workspace: WS, id })).status).toBe(404);
    const actions = (await k('audit_log').where({ entity: 'business_case', entityId: id }).select('action')).map((a) => a.action).sort();
    expect(actions).toEqual(['copy', 'delete', 'rename']);
  });

  it('answers 404 for another workspace\'s case and for a nonsense id', async () => {
    as('analyst');
    const corrin = await k('workspaces').where({ slug: 'corrin-flats' }).first('id');
    const now = new Date().toISOString();
    const [row] = await k('business_cases').insert({ workspaceId: corrin.id, name: 'theirs', selection: '[]', plan: '{}', createdAt: now, updatedAt: now }).returning('id');
    const otherId = String(typeof row === 'object' ? row.id : row);
    expect((await call(getCase, { workspace: WS, id: otherId })).status).toBe(404);
    expect((await call(getResult, { workspace: WS, id: otherId })).status).toBe(404);
    expect((await call(patchCase, { workspace: WS, id: otherId }, { method: 'PATCH', body: { version: 1, name: 'mine now' } })).status).toBe(404);
    expect((await call(getCase, { workspace: WS, id: 'abc' })).status).toBe(404);
    as('viewer');
    expect((await call(getCase, { workspace: 'corrin-flats', id: otherId })).status).toBe(403);
  });
});
