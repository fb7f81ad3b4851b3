/**
 * Sensitivity and Monte Carlo endpoints on SQLite and PostgreSQL: access
 * (401/403/404), problems listed (422), figures equal to the engine run on the
 * case built from stored data, and Monte Carlo runs in worker threads with
 * progress, a stored result, an audit row and cancel.
 */
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { evaluateCase } from '@/lib/engine';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { whenFinished } from '@/lib/risk/jobs';
import { CANCELLED_NOT_RUNNING, failInterruptedRuns, INTERRUPTED_BY_RESTART } from '@/lib/risk/runs';
import { GET as getDrivers } from '@/app/api/workspaces/[workspace]/cases/[id]/drivers/route';
import { POST as postTornado } from '@/app/api/workspaces/[workspace]/cases/[id]/tornado/route';
import { POST as postSpider } from '@/app/api/workspaces/[workspace]/cases/[id]/spider/route';
import { POST as postBreakEven } from '@/app/api/workspaces/[workspace]/cases/[id]/break-even/route';
import { POST as postTwoWay } from '@/app/api/workspaces/[workspace]/cases/[id]/two-way/route';
import { GET as listRuns, POST as startRun } from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/route';
import { DELETE as cancelRun, GET as getRun } from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/[job]/route';
import { createTestDb, userIds } from '../support/test-db';
import { insertDemoCase } from '../support/demo-case';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

beforeAll(async () => {
  process.env.HAULCASE_MC_WORKER = await buildMonteCarloWorker();
});

describe.each(backends)('risk endpoints on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};
  let caseId: number;
  let params: { workspace: string; id: string };

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
    caseId = await insertDemoCase(k, WS);
    params = { workspace: WS, id: String(caseId) };
  });
  afterAll(async () => destroy());

  it('answers 401 signed out, 403 outside the workspace, 404 for an unknown or foreign case', async () => {
    signInAs(null);
    expect((await call(getDrivers, params)).status).toBe(401);
    signInAs(ids['admin@corrin.test']);
    expect((await call(getDrivers, params)).status).toBe(403);
    // the analyst belongs to both sites: the Aldervane case is not found through Corrin Flats
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(getDrivers, { workspace: 'corrin-flats', id: String(caseId) })).status).toBe(404);
    expect((await call(getDrivers, { workspace: WS, id: '99999' })).status).toBe(404);
    expect((await call(getDrivers, { workspace: WS, id: 'abc' })).status).toBe(404);
  });

  it('lets a viewer read the drivers and a tornado equal to the engine re-run on the stored case', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const d = await call(getDrivers, params, { url: 'http://127.0.0.1/api/x?truck=T3-06' });
    expect(d.status).toBe(200);
    expect(d.body.truckId).toBe('T3-06');
    expect(d.body.drivers.map((x: { id: string }) => x.id)).toContain('modulePrice@kestrel-km2700');
    // the headline the Monte Carlo histogram marks: the case's own valuation, ΔNPV repower vs rebuild
    expect(d.body.headline.valuation).toBe('expected');

    const r = await call(postTornado, params, { body: { metric: { kind: 'fleet-best' }, drivers: ['fuelPrice'], ranges: { fuelPrice: { low: 0.9, high: 1.3 } } } });
    expect(r.status).toBe(200);
    const set = await k('assumption_sets').where({ workspaceId: (await k('workspaces').where({ slug: WS }).first('id')).id }).orderBy('id').first('id');
    const wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    const stored = await buildCaseFile(wsId, { name: 'x', assumptionSetId: set.id }, k);
    const at = (fuelPrice: number) => evaluateCase({ ...stored, assumptions: { ...stored.assumptions, fuelPrice } } as never).fleet.npv.best;
    expect(r.body.rows[0].metricLow).toBeCloseTo(at(0.9), 4);
    expect(r.body.rows[0].metricHigh).toBeCloseTo(at(1.3), 4);
    const plain = evaluateCase(stored as never);
    expect(d.body.headline.fleetBestNpv).toBeCloseTo(plain.fleet.npv.best, 2);
    let fleetDelta = 0;
    for (const t of plain.trucks) {
      expect(d.body.headline.trucks[t.id]).toBeCloseTo(t.repowerVsRebuild.deltaNpv, 4);
      fleetDelta += t.repowerVsRebuild.deltaNpv;
    }
    expect(d.body.headline.fleetDeltaNpv).toBeCloseTo(fleetDelta, 2);
  });

  it('answers spider, break-even and two-way for one truck', async () => {
    signInAs(ids['approver@aldervane.test']);
    const metric = { kind: 'truck-delta', truckId: 'T3-06' };
    const s = await call(postSpider, params, { body: { metric, drivers: ['fuelPrice', 'discountRate'] } });
    expect(s.status).toBe(200);
    expect(s.body.lines).toHaveLength(2);
    const b = await call(postBreakEven, params, { body: { metric, drivers: ['modulePrice@kestrel-km2700', 'fuelPrice'] } });
    expect(b.status).toBe(200);
    expect(b.body.rows[0].kind).toBe('crossing');
    expect(b.body.rows[1].kind).toBe('none');
    const t = await call(postTwoWay, params, { body: { metric, row: 'fuelPrice', column: 'discountRate' } });
    expect(t.status).toBe(200);
    expect(t.body.table.metric).toHaveLength(5);
  });

  it('lists every problem of a bad request with its path (422)', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const r = await call(postTornado, params, {
      body: { metric: { kind: 'truck-delta', truckId: 'NOPE' }, drivers: ['fuelPrice', 'noSuchDriver', 'modulePrice@nope'], ranges: { taxRate: { low: 0.2, high: 1.5 } } },
    });
    expect(r.status).toBe(422);
    const paths = r.body.problems.map((p: { path: string }) => p.path);
    expect(paths).toEqual(expect.arrayContaining(['metric.truckId', 'drivers[1]', 'drivers[2]', 'ranges.taxRate.high']));
    const be = await call(postBreakEven, params, { body: { metric: { kind: 'fleet-best' } } });
    expect(be.status).toBe(422);
    expect(be.body.problems[0].path).toBe('metric');
    const notJson = await call(postSpider, params, { body: '{oops' });
    expect(notJson.status).toBe(422);
    const mc = await call(startRun, params, {
      body: { iterations: 100, seed: 1, distributions: [{ driver: 'fuelPrice', distribution: { kind: 'uniform', min: -1, max: 2 } }, { driver: 'fuelPrice', distribution: { kind: 'fixed' } }] },
    });
    expect(mc.status).toBe(422);
    expect(mc.body.problems.map((p: { path: string }) => p.path)).toEqual(['distributions[0].distribution.min', 'distributions[1].driver']);
    expect(await k('monte_carlo_runs').count({ n: '*' }).first()).toEqual({ n: pg ? '0' : 0 });
  });

  it('refuses a Monte Carlo run to a viewer (403), and starts nothing', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const r = await call(startRun, params, { body: { iterations: 100, seed: 1 } });
    expect(r.status).toBe(403);
  });

  it('runs a Monte Carlo in workers: progress, then the stored result and an audit row', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const body = {
      iterations: 200,
      seed: 42,
      sampleFailures: true,
      distributions: [{ driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.85, mode: 1.05, max: 1.4 } }],
    };
    const started = await call(startRun, params, { body });
    expect(started.status).toBe(202);
    const runId = started.body.run.id;
    expect(started.body.run.status).toBe('running');
    // the request thread is free while the workers run: another request is answered meanwhile
    const meanwhile = await call(getDrivers, params);
    expect(meanwhile.status).toBe(200);
    await whenFinished(runId);
    const got = await call(getRun, { ...params, job: runId });
    expect(got.body.run.status).toBe('done');
    expect(got.body.run.done).toBe(200);
    expect(got.body.run.result.iterations).toBe(200);
    expect(got.body.run.result.trucks).toHaveLength(24);
    const fleet = got.body.run.result.fleet.deltaNpv;
    expect(fleet.p10).toBeLessThanOrEqual(fleet.p50);
    expect(fleet.p50).toBeLessThanOrEqual(fleet.p90);
    const row = await k('monte_carlo_runs').where({ id: runId }).first();
    expect(row.status).toBe('done');
    const audit = await k('audit_log').where({ entity: 'monte_carlo_run', entityId: runId }).first();
    expect(audit.action).toBe('run');
    const list = await call(listRuns, params);
    expect(list.body.runs[0].id).toBe(runId);

    // same seed, same figures
    const again = await call(startRun, params, { body });
    await whenFinished(again.body.run.id);
    const second = await call(getRun, { ...params, job: again.body.run.id });
    expect(second.body.run.result.fleet.deltaNpv.mean).toBe(fleet.mean);
  });

  it('stops a run at the time limit and keeps what it found', async () => {
    signInAs(ids['analyst@aldervane.test']);
    process.env.HAULCASE_MC_TIME_LIMIT_MS = '200';
    try {
      const started = await call(startRun, params, { body: { iterations: 100000, seed: 3 } });
      expect(started.status).toBe(202);
      const finished = await whenFinished(started.body.run.id);
      expect(finished?.status).toBe('timed-out');
      expect(finished!.done).toBeLessThan(100000);
      const row = await k('monte_carlo_runs').where({ id: started.body.run.id }).first();
      expect(row.status).toBe('timed-out');
      expect(row.done).toBe(finished!.done);
    } finally {
      delete process.env.HAULCASE_MC_TIME_LIMIT_MS;
    }
  });

  it('cancels a long run: the workers stop and the iterations done are summarised', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const started = await call(startRun, params, { body: { iterations: 100000, seed: 9 } });
    const runId = started.body.run.id;
    const cancelled = await call(cancelRun, { ...params, job: runId }, { method: 'DELETE' });
    expect(cancelled.status).toBe(200);
    const finished = await whenFinished(runId);
    expect(finished?.status).toBe('cancelled');
    expect(finished!.done).toBeLessThan(100000);
    const row = await k('monte_carlo_runs').where({ id: runId }).first();
    expect(row.status).toBe('cancelled');
    expect((await call(cancelRun, { ...params, job: runId }, { method: 'DELETE' })).status).toBe(409);
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(cancelRun, { ...params, job: runId }, { method: 'DELETE' })).status).toBe(403);
    expect((await call(getRun, { ...params, job: 'no-such-run' })).status).toBe(404);
  });

  describe('runs a restart interrupted', () => {
    // what a server killed mid-run leaves behind: a row still running that no worker holds
    const leftRunning = async (id: string) => {
      const wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
      await k('monte_carlo_runs').insert({ id, workspaceId: wsId, caseId, spec: JSON.stringify({ iterations: 1000, seed: 1 }), status: 'running', iterations: 1000, done: 120, createdBy: ids['analyst@aldervane.test'], createdAt: '2026-01-01T00:00:00.000Z' });
    };

    it('are marked failed, with the reason, when a server starts; finished runs are left as they were', async () => {
      signInAs(ids['viewer@aldervane.test']);
      await leftRunning('00000000-0000-4000-8000-000000000001');
      const finishedBefore = await k('monte_carlo_runs').whereNot({ status: 'running' }).orderBy('id').select('id', 'status', 'finishedAt');
      expect((await call(getRun, { ...params, job: '00000000-0000-4000-8000-000000000001' })).body.run.status).toBe('running');
      expect(await failInterruptedRuns(k, '2026-01-02T00:00:00.000Z')).toBe(1);
      const r = await call(getRun, { ...params, job: '00000000-0000-4000-8000-000000000001' });
      expect(r.body.run).toMatchObject({ status: 'failed', error: INTERRUPTED_BY_RESTART, finishedAt: '2026-01-02T00:00:00.000Z', done: 120 });
      expect(await k('monte_carlo_runs').whereNot({ status: 'running' }).whereNot({ id: '00000000-0000-4000-8000-000000000001' }).orderBy('id').select('id', 'status', 'finishedAt')).toEqual(finishedBefore);
      expect(await failInterruptedRuns(k)).toBe(0);
    });

    it('can be cancelled on a server that does not hold them: marked cancelled with the reason, and audited', async () => {
      signInAs(ids['analyst@aldervane.test']);
      const id = '00000000-0000-4000-8000-000000000002';
      await leftRunning(id);
      const r = await call(cancelRun, { ...params, job: id }, { method: 'DELETE' });
      expect(r.status).toBe(200);
      expect(r.body.run).toMatchObject({ status: 'cancelled', error: CANCELLED_NOT_RUNNING });
      const row = await k('monte_carlo_runs').where({ id }).first();
      expect(row).toMatchObject({ status: 'cancelled', error: CANCELLED_NOT_RUNNING });
      expect(row.finishedAt).toBeTruthy();
      expect(await k('audit_log').where({ entity: 'monte_carlo_run', entityId: id, action: 'cancel' })).toHaveLength(1);
      expect((await call(getRun, { ...params, job: id })).body.run.status).toBe('cancelled');
      expect((await call(cancelRun, { ...params, job: id }, { method: 'DELETE' })).status).toBe(409);
    });
  });
});
