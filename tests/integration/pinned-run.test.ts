/**
 * The proposal measure and the pinned Monte Carlo run of a case on SQLite and
 * PostgreSQL: migration 0014 (the column, its foreign key, and that adding
 * and dropping it keeps every row that references the cases);
 * `fetchPinnedRun`; the sensitivity routes and Monte Carlo on the proposal;
 * the pin route (roles, case states, versions, audit).
 */
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { evaluateCaseDetailed } from '@/lib/engine';
import { proposalFromProgramme, proposalGainVsRebuild } from '@/lib/cases/proposal';
import { programmeOf } from '@/lib/cases/programme';
import { readPlanSettings } from '@/lib/validation/business-case';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { whenFinished } from '@/lib/risk/jobs';
import { fetchPinnedRun } from '@/lib/risk/runs';
import { MEASURE_LABELS } from '@/lib/risk/measures';
import { GET as getDrivers } from '@/app/api/workspaces/[workspace]/cases/[id]/drivers/route';
import { POST as postTornado } from '@/app/api/workspaces/[workspace]/cases/[id]/tornado/route';
import { POST as postBreakEven } from '@/app/api/workspaces/[workspace]/cases/[id]/break-even/route';
import { GET as listRuns, POST as startRun } from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/route';
import { GET as getRun } from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/[job]/route';
import { DELETE as unpinRoute, GET as getPinned, PUT as pinRoute } from '@/app/api/workspaces/[workspace]/cases/[id]/pinned-run/route';
import { DELETE as deleteCaseRoute } from '@/app/api/workspaces/[workspace]/cases/[id]/route';
import { createTestDb, userIds } from '../support/test-db';
import { insertDemoCase } from '../support/demo-case';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

beforeAll(async () => {
  process.env.HAULCASE_MC_WORKER = await buildMonteCarloWorker();
});

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

/** A summary whose figures are easy to recognise: every field the same number. */
function summary(x: number) {
  return { count: 10, mean: x, sd: 1, min: x - 5, max: x + 5, p5: x - 4, p10: x - 3, p50: x + 0.5, p90: x + 3, p95: x + 4, probNegative: 0.25, histogram: [], runningMean: [] };
}

async function insertRun(k: Knex, o: { id: string; workspaceId: number; caseId: number; userId: number | null; status?: string; spec?: object; withProposal?: boolean }) {
  const result = {
    iterations: 10,
    trucks: [],
    fleet: { deltaNpv: summary(100), bestNpv: summary(200), ...(o.withProposal === false ? {} : { proposalNpv: summary(300) }) },
  };
  await k('monte_carlo_runs').insert({
    id: o.id, workspaceId: o.workspaceId, caseId: o.caseId, status: o.status ?? 'done', iterations: 10, done: 10,
    spec: JSON.stringify(o.spec ?? { iterations: 10, seed: 7, sampleFailures: true, distributions: [], measure: 'proposal' }),
    result: (o.status ?? 'done') === 'done' ? JSON.stringify(result) : null,
    createdBy: o.userId, createdAt: '2026-12-01T10:00:00.000Z', finishedAt: '2026-12-01T10:00:05.000Z',
  });
}

describe.each(backends)('pinned Monte Carlo run on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};
  let caseId: number;
  let workspaceId: number;

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
    caseId = await insertDemoCase(k, WS);
    workspaceId = (await k('workspaces').where({ slug: WS }).first('id')).id;
  });
  afterAll(async () => destroy());

  it('keeps every run, event and revision when 0014 is rolled back and applied again', async () => {
    const analyst = ids['analyst@aldervane.test'];
    await insertRun(k, { id: 'keep-1', workspaceId, caseId, userId: analyst });
    const revision = await insertDemoCase(k, WS, 'A revision');
    await k('business_cases').where({ id: revision }).update({ revisionOf: caseId });
    await k('case_events').insert({ workspaceId, caseId, userId: analyst, action: 'comment', comment: 'kept', at: '2026-12-01T10:00:00.000Z' });
    const counts = async () => ({
      runs: Number((await k('monte_carlo_runs').count({ n: '*' }))[0].n),
      events: Number((await k('case_events').count({ n: '*' }))[0].n),
      revisionOf: (await k('business_cases').where({ id: revision }).first('revisionOf')).revisionOf,
    });
    const before = await counts();
    expect(before.runs).toBeGreaterThanOrEqual(1);
    await k.migrate.down({ name: '0014_pinned_run' }); // 0014 only (later migrations stay)
    expect(await k.schema.hasColumn('business_cases', 'pinnedRunId')).toBe(false);
    expect(await counts()).toEqual(before);
    await k.migrate.latest();
    expect(await k.schema.hasColumn('business_cases', 'pinnedRunId')).toBe(true);
    expect(await counts()).toEqual(before);
    // the column refers to a run: an unknown id is refused by the database
    await expect(k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'no-such-run' })).rejects.toThrow(/foreign key/i);
  });

  it('answers null with no pinned run, then the pinned finished run with its settings, author, times and summary', async () => {
    expect(await fetchPinnedRun(caseId, k)).toBeNull();
    const analyst = ids['analyst@aldervane.test'];
    const spec = { iterations: 10, seed: 4242, sampleFailures: false, distributions: [{ driver: 'fuelPrice', distribution: { kind: 'uniform', min: 0.9, max: 1.3 } }], measure: 'proposal' };
    await insertRun(k, { id: 'pin-1', workspaceId, caseId, userId: analyst, spec });
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'pin-1' });
    const user = await k('users').where({ id: analyst }).first('name', 'email');
    const p = await fetchPinnedRun(caseId, k);
    expect(p).toEqual({
      id: 'pin-1', caseId, spec, iterations: 10, seed: 4242, sampleFailures: false, distributions: spec.distributions,
      measure: { kind: 'proposal', label: MEASURE_LABELS.proposal, truckId: null },
      author: { id: analyst, name: user.name, email: user.email },
      startedAt: '2026-12-01T10:00:00.000Z', finishedAt: '2026-12-01T10:00:05.000Z',
      // the proposal's figure (300 in the stored result), not repower-everything's (100) or the best mix's (200)
      summary: { mean: 300, p10: 297, p50: 300.5, p90: 303, probLoss: 0.25 },
    });
  });

  it('reads an older run on the measure it was made for (repower every truck) and ignores an unfinished one', async () => {
    await insertRun(k, { id: 'old-1', workspaceId, caseId, userId: null, spec: { iterations: 10, seed: 1, sampleFailures: true, distributions: [] }, withProposal: false });
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'old-1' });
    const p = await fetchPinnedRun(caseId, k);
    expect(p?.measure).toEqual({ kind: 'fleet-delta', label: MEASURE_LABELS['fleet-delta'], truckId: null });
    expect(p?.summary.mean).toBe(100);
    expect(p?.author).toBeNull();
    await insertRun(k, { id: 'failed-1', workspaceId, caseId, userId: null, status: 'failed' });
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: 'failed-1' });
    expect(await fetchPinnedRun(caseId, k)).toBeNull();
    await k('business_cases').where({ id: caseId }).update({ pinnedRunId: null });
  });
});

describe.each(backends)('the proposal measure and the pin route on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};
  let caseId: number;
  let workspaceId: number;
  let params: { workspace: string; id: string };
  // the proposal worked out here from the stored case: the engine's result, ranked and planned under the saved budgets
  let expected: { policies: Record<string, string>; timings: Record<string, unknown>; gain: number };

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
    caseId = await insertDemoCase(k, WS);
    workspaceId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    params = { workspace: WS, id: String(caseId) };
    // a budget that leaves trucks out, so the proposal differs from repowering every truck
    await k('business_cases').where({ id: caseId }).update({ plan: JSON.stringify({ budgets: { 0: 4_000_000, 1: 4_000_000 }, swapsPerMonth: 2, startMonth: '2027-01' }) });
    const set = await k('assumption_sets').where({ workspaceId }).orderBy('id').first('id');
    const file = await buildCaseFile(workspaceId, { name: 'x', assumptionSetId: set.id }, k);
    // the proposal as lib/cases/proposal.ts builds it: the fleet programme under the saved budgets and shop capacity
    const { result } = evaluateCaseDetailed(file as never, { trusted: true });
    const settings = readPlanSettings(JSON.stringify({ budgets: { 0: 4_000_000, 1: 4_000_000 }, swapsPerMonth: 2, startMonth: '2027-01' }), '2027-01-01');
    const proposal = proposalFromProgramme(result, await programmeOf(file as never, settings), settings);
    const policies = proposal.policies;
    expected = { policies, timings: proposal.timingSpecs, gain: proposalGainVsRebuild(result, policies, proposal.timings) };
  });
  afterAll(async () => destroy());

  it('the proposal leaves trucks out under the budget (the case this test needs)', () => {
    const repowered = Object.values(expected.policies).filter((p) => p === 'repower').length;
    expect(repowered).toBeGreaterThan(0);
    expect(repowered).toBeLessThan(24);
  });

  it('drivers, tornado and break-even read the proposal: its policies from the saved plan, its ΔNPV against rebuilding', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const d = await call(getDrivers, params);
    expect(d.status).toBe(200);
    expect(d.body.proposal.policies).toEqual(expected.policies);
    expect(d.body.headline.proposalDeltaNpv).toBeCloseTo(expected.gain, 2);
    const t = await call(postTornado, params, { body: { metric: { kind: 'proposal' }, drivers: ['fuelPrice'] } });
    expect(t.status).toBe(200);
    expect(t.body.metric).toEqual({ kind: 'proposal', policies: expected.policies, timings: expected.timings });
    expect(t.body.baseValue).toBeCloseTo(expected.gain, 2);
    const b = await call(postBreakEven, params, { body: { metric: { kind: 'proposal' }, drivers: ['fuelPrice'] } });
    expect(b.status).toBe(200);
    expect(b.body.baseValue).toBeCloseTo(expected.gain, 2);
  });

  let runId = '';
  it('a Monte Carlo run is read on the proposal by default, keeps the policies it used and sums the proposal', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const started = await call(startRun, params, { body: { iterations: 60, seed: 5, sampleFailures: false } });
    expect(started.status).toBe(202);
    runId = started.body.run.id;
    expect(started.body.run.spec).toMatchObject({ measure: 'proposal', proposal: expected.policies });
    expect(started.body.run.author.email).toBe('analyst@aldervane.test');
    await whenFinished(runId);
    const got = await call(getRun, { ...params, job: runId });
    const p = got.body.run.result.fleet.proposalNpv;
    // with no driver drawn and failures on the median path every iteration is the case itself: the proposal's gain
    // on the median path (the headline of a median-path set), so the spread is nil
    expect(p.count).toBe(60);
    expect(p.max - p.min).toBeCloseTo(0, 6);
    const truck = await call(startRun, params, { body: { iterations: 20, seed: 5, measure: 'truck-delta', truckId: 'NOPE' } });
    expect(truck.status).toBe(422);
    expect(truck.body.problems).toEqual([{ path: 'truckId', message: 'no truck "NOPE" in this case' }]);
    const noTruck = await call(startRun, params, { body: { iterations: 20, seed: 5, measure: 'truck-delta' } });
    expect(noTruck.status).toBe(422);
    expect(noTruck.body.problems[0].path).toBe('truckId');
  });

  const version = async () => Number((await k('business_cases').where({ id: caseId }).first('version')).version);

  it('answers 401 signed out and 403 to a viewer, and changes nothing', async () => {
    const v = await version();
    signInAs(null);
    expect((await call(pinRoute, params, { method: 'PUT', body: { runId, version: v } })).status).toBe(401);
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(pinRoute, params, { method: 'PUT', body: { runId, version: v } })).status).toBe(403);
    expect((await call(unpinRoute, params, { method: 'DELETE', url: `http://127.0.0.1/api/x?version=${v}` })).status).toBe(403);
    expect(await version()).toBe(v);
    expect((await call(getPinned, params)).body).toEqual({ run: null });
  });

  it('lets an analyst pin a finished proposal run: version + 1, an audit row, the run shown pinned', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const v = await version();
    const r = await call(pinRoute, params, { method: 'PUT', body: { runId, version: v } });
    expect(r.status).toBe(200);
    expect(r.body.version).toBe(v + 1);
    expect(r.body.run).toMatchObject({ id: runId, seed: 5, iterations: 60, sampleFailures: false, measure: { kind: 'proposal' }, author: { email: 'analyst@aldervane.test' } });
    expect((await k('business_cases').where({ id: caseId }).first('pinnedRunId')).pinnedRunId).toBe(runId);
    const audit = await k('audit_log').where({ entity: 'business_case', entityId: String(caseId), action: 'pin-run' }).first();
    expect(audit.userId).toBe(ids['analyst@aldervane.test']);
    expect(JSON.parse(audit.after)).toMatchObject({ pinnedRunId: runId });
    const list = await call(listRuns, params);
    expect(list.body).toMatchObject({ pinnedRunId: runId, caseVersion: v + 1, caseStatus: 'draft' });
    // the viewer reads it
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(getPinned, params)).body.run.id).toBe(runId);
  });

  it('refuses a stale version (409), an unfinished run or one read on another measure (422), a run of another case (404)', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const v = await version();
    expect((await call(pinRoute, params, { method: 'PUT', body: { runId, version: v - 1 } })).status).toBe(409);
    await insertRun(k, { id: 'failed-pin', workspaceId, caseId, userId: null, status: 'failed' });
    const failed = await call(pinRoute, params, { method: 'PUT', body: { runId: 'failed-pin', version: v } });
    expect(failed.status).toBe(422);
    expect(failed.body.problems).toEqual([{ path: 'runId', message: 'only a finished run can be pinned; this one is failed' }]);
    await insertRun(k, { id: 'delta-pin', workspaceId, caseId, userId: null, spec: { iterations: 10, seed: 1, sampleFailures: true, distributions: [], measure: 'fleet-delta' } });
    const delta = await call(pinRoute, params, { method: 'PUT', body: { runId: 'delta-pin', version: v } });
    expect(delta.status).toBe(422);
    expect(delta.body.problems[0].message).toMatch(/pin a run read on the ΔNPV of the proposal against rebuilding every engine; this one was read on: Comparison: ΔNPV of repowering every truck/);
    const other = await insertDemoCase(k, WS, 'Another case');
    await insertRun(k, { id: 'other-case', workspaceId, caseId: other, userId: null });
    expect((await call(pinRoute, params, { method: 'PUT', body: { runId: 'other-case', version: v } })).status).toBe(404);
    const bad = await call(pinRoute, params, { method: 'PUT', body: { runId: '', version: 0 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems.map((p: { path: string }) => p.path)).toEqual(['runId', 'version']);
    expect(await version()).toBe(v);
    expect((await k('business_cases').where({ id: caseId }).first('pinnedRunId')).pinnedRunId).toBe(runId);
  });

  it('refuses pin and unpin while the case is submitted, approved or rejected (the pinned run is frozen with it)', async () => {
    signInAs(ids['admin@aldervane.test']);
    for (const status of ['submitted', 'approved', 'rejected']) {
      await k('business_cases').where({ id: caseId }).update({ status });
      const v = await version();
      const pin = await call(pinRoute, params, { method: 'PUT', body: { runId, version: v } });
      expect(pin.status).toBe(409);
      expect(pin.body.error).toContain(`This case is ${status}; its pinned Monte Carlo run was frozen with the submission`);
      expect((await call(unpinRoute, params, { method: 'DELETE', url: `http://127.0.0.1/api/x?version=${v}` })).status).toBe(409);
      expect((await k('business_cases').where({ id: caseId }).first('pinnedRunId')).pinnedRunId).toBe(runId);
    }
  });

  it('lets an approver unpin and pin again on a returned case; unpin needs the version', async () => {
    await k('business_cases').where({ id: caseId }).update({ status: 'returned' });
    signInAs(ids['approver@aldervane.test']);
    const missing = await call(unpinRoute, params, { method: 'DELETE' });
    expect(missing.status).toBe(422);
    expect(missing.body.problems[0].path).toBe('version');
    const v = await version();
    const un = await call(unpinRoute, params, { method: 'DELETE', url: `http://127.0.0.1/api/x?version=${v}` });
    expect(un.status).toBe(200);
    expect(un.body.version).toBe(v + 1);
    expect(await fetchPinnedRun(caseId, k)).toBeNull();
    expect((await k('audit_log').where({ entity: 'business_case', entityId: String(caseId), action: 'unpin-run' }).first()).userId).toBe(ids['approver@aldervane.test']);
    // nothing pinned: unpin again is a 409
    expect((await call(unpinRoute, params, { method: 'DELETE', url: `http://127.0.0.1/api/x?version=${v + 1}` })).status).toBe(409);
    expect((await call(pinRoute, params, { method: 'PUT', body: { runId, version: v + 1 } })).status).toBe(200);
  });

  it('deletes a draft case that has a pinned run, its runs with it', async () => {
    signInAs(ids['analyst@aldervane.test']);
    await k('business_cases').where({ id: caseId }).update({ status: 'draft' });
    const v = await version();
    const r = await call(deleteCaseRoute, params, { method: 'DELETE', url: `http://127.0.0.1/api/x?version=${v}` });
    expect(r.status).toBe(204);
    expect(await k('business_cases').where({ id: caseId }).first()).toBeUndefined();
    expect(await k('monte_carlo_runs').where({ caseId }).first()).toBeUndefined();
  });
});
