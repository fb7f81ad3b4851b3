/**
 * Monte Carlo runs on the PostgreSQL job queue (pg-boss, lib/risk/backends/queue.ts):
 * two queue backends in this process stand for two app servers on one
 * database. The routes are called as each server would answer them
 * (`useRunBackendForTests`): a run started on A is polled to completion and
 * read on B; a cancel on B stops the run A holds; a server that takes no more
 * than its limit; a server that dies mid-run has its run retried on the other
 * after the queue's expiry, or marked failed when no retry is left — never left
 * running.
 */
import { afterAll, afterEach, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { useRunBackendForTests } from '@/lib/risk/backend';
import { createQueueBackend, RUN_LOST, CANCELLED_QUEUED, NEVER_QUEUED, type QueueBackend } from '@/lib/risk/backends/queue';
import { whenFinished } from '@/lib/risk/jobs';
import { POST as startRoute } from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/route';
import { DELETE as cancelRoute, GET as getRoute } from '@/app/api/workspaces/[workspace]/cases/[id]/monte-carlo/[job]/route';
import { createTestDb, userIds } from '../support/test-db';
import { insertDemoCase } from '../support/demo-case';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
/** the queue's expiry in these tests (seconds); a run's time limit is kept below it */
const EXPIRE_S = 3;

let k: Knex;
let url: string;
let destroy: () => Promise<void>;
let ids: Record<string, number>;
let params: { workspace: string; id: string };
const servers: QueueBackend[] = [];

function server(name: string, o: { maxRunning?: number } = {}): QueueBackend {
  // one worker thread per run, so a run of 100,000 iterations lasts a few seconds
  const b = createQueueBackend({ connectionString: url, db: () => k, server: name, maxRunning: o.maxRunning ?? 1, expireSeconds: EXPIRE_S, pollSeconds: 0.5, progressMs: 100, workers: 1 });
  servers.push(b);
  return b;
}

/** Answer a route as this server would. */
async function on<T>(b: QueueBackend | null, f: () => Promise<T>): Promise<T> {
  useRunBackendForTests(b);
  try {
    return await f();
  } finally {
    useRunBackendForTests(null);
  }
}

async function until<T>(what: string, f: () => Promise<T | null | undefined | false>, ms = 20_000): Promise<T> {
  const t0 = Date.now();
  for (;;) {
    const v = await f();
    if (v) return v;
    if (Date.now() - t0 > ms) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

const claim = (runId: string) => k('monte_carlo_run_claims').where({ runId }).first();
const row = (runId: string) => k('monte_carlo_runs').where({ id: runId }).first();
const body = (iterations: number, seed: number) => ({
  iterations, seed, sampleFailures: true,
  distributions: [{ driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.85, mode: 1.05, max: 1.4 } }],
});

beforeAll(async () => {
  process.env.HAULCASE_MC_WORKER = await buildMonteCarloWorker();
  const t = await createTestDb({ pgUrl: inject('pgUrl') });
  k = t.k;
  url = t.url!;
  destroy = t.destroy;
  useDbForTests(k);
  ids = await userIds(k);
  params = { workspace: WS, id: String(await insertDemoCase(k, WS)) };
  signInAs(ids['analyst@aldervane.test']);
});

afterEach(async () => {
  delete process.env.HAULCASE_MC_TIME_LIMIT_MS;
  delete process.env.HAULCASE_MC_QUEUE_RETRIES;
  await Promise.all(servers.splice(0).map((s) => s.stop()));
});

afterAll(async () => destroy());

describe('Monte Carlo runs on the job queue, two servers', () => {
  it('starts on A at once, runs on a server, and is polled to completion and read on B, with the same figures as the in-process pool', async () => {
    const a = server('A');
    const b = server('B');
    await Promise.all([a.startWorkers(), b.startWorkers()]);
    const started = await on(a, () => call(startRoute, params, { body: body(400, 42) }));
    expect(started.body).toMatchObject({ run: { id: expect.any(String) } });
    expect(started.status).toBe(202);
    expect(started.body.run).toMatchObject({ status: 'running', done: 0, result: null, finishedAt: null });
    const runId = started.body.run.id;

    const seen: number[] = [];
    const done = await until('the run to finish, read on B', async () => {
      const r = await on(b, () => call(getRoute, { ...params, job: runId }));
      expect(r.status).toBe(200);
      seen.push(r.body.run.done);
      return r.body.run.finishedAt ? r.body.run : null;
    });
    expect(done.status).toBe('done');
    expect(done.done).toBe(400);
    expect(done.result.iterations).toBe(400);
    expect(done.result.trucks).toHaveLength(24);
    expect(seen).toEqual([...seen].sort((x, y) => x - y)); // progress only grows
    expect(await b.result((await row(runId)).workspaceId, Number(params.id), runId)).toEqual(done.result);
    const c = await claim(runId);
    expect(c.attempt).toBe(1);
    expect(['A', 'B']).toContain(c.server);
    expect(await k('audit_log').where({ entity: 'monte_carlo_run', entityId: runId, action: 'run' })).toHaveLength(1);

    // the same spec on the in-process pool (the SQLite path's engine code): the same figures
    const local = await on(null, () => call(startRoute, params, { body: body(400, 42) }));
    await whenFinished(local.body.run.id);
    const localRun = (await on(null, () => call(getRoute, { ...params, job: local.body.run.id }))).body.run;
    expect(localRun.status).toBe('done');
    expect(done.result.fleet.deltaNpv.mean).toBe(localRun.result.fleet.deltaNpv.mean);
    expect(done.result.fleet.proposalNpv.p10).toBe(localRun.result.fleet.proposalNpv.p10);
  });

  it('holds the per-server limit, and a cancel on B stops the run A holds and ends a queued one at once', async () => {
    const a = server('A', { maxRunning: 1 });
    const b = server('B'); // answers requests only: its workers are not started
    await a.startWorkers();
    const first = (await on(a, () => call(startRoute, params, { body: body(100_000, 7) }))).body.run.id;
    const second = (await on(a, () => call(startRoute, params, { body: body(100_000, 8) }))).body.run.id;
    await until('A to take a run', async () => (await row(first)).done > 0 || (await row(second)).done > 0);
    const [held, queued] = (await row(first)).done > 0 ? [first, second] : [second, first];
    await new Promise((r) => setTimeout(r, 1500)); // three polls: A's one worker is busy, so the other run waits
    expect((await row(held)).finishedAt).toBeNull(); // still running: its one worker was busy all along
    expect(a.holding()).toEqual([held]);
    expect((await claim(queued)).attempt).toBe(0);
    expect((await row(queued)).status).toBe('running');

    // the queued run, cancelled on B: ended at once, nothing ran
    const cq = await on(b, () => call(cancelRoute, { ...params, job: queued }, { method: 'DELETE' }));
    expect(cq.status).toBe(200);
    expect(cq.body.run).toMatchObject({ status: 'cancelled', error: CANCELLED_QUEUED });
    expect(await row(queued)).toMatchObject({ status: 'cancelled', done: 0, error: CANCELLED_QUEUED });

    // the running one, cancelled on B: A sees the flag at its next progress write, stops and summarises what it did
    const cr = await on(b, () => call(cancelRoute, { ...params, job: held }, { method: 'DELETE' }));
    expect(cr.status).toBe(200);
    expect(cr.body.run.status).toBe('cancelled');
    await until('A to stop the run', async () => (a.holding().length === 0 ? true : null), 10_000);
    const ended = await until('the cancelled run to be written', async () => {
      const r = (await on(b, () => call(getRoute, { ...params, job: held }))).body.run;
      return r.finishedAt ? r : null;
    });
    expect(ended.status).toBe('cancelled');
    expect(ended.done).toBeGreaterThan(0);
    expect(ended.done).toBeLessThan(100_000);
    expect(ended.result.iterations).toBe(ended.done);
    expect(await k('audit_log').where({ entity: 'monte_carlo_run', action: 'cancel' }).whereIn('entityId', [held, queued])).toHaveLength(2);
    expect((await on(b, () => call(cancelRoute, { ...params, job: held }, { method: 'DELETE' }))).status).toBe(409);
    // the queued job never reaches a worker: A stays idle
    await new Promise((r) => setTimeout(r, 1200));
    expect(a.holding()).toEqual([]);
    expect((await claim(queued)).attempt).toBe(0);
  });

  it('retries on B, after the expiry, a run whose server A died mid-run; no half-written run is left', async () => {
    process.env.HAULCASE_MC_TIME_LIMIT_MS = '2000'; // below the expiry: a live server always ends its own run first
    const a = server('A');
    await a.startWorkers();
    const runId = (await on(a, () => call(startRoute, params, { body: body(100_000, 11) }))).body.run.id;
    await until('A to write progress', async () => (await row(runId)).done > 0);
    a.simulateCrash();
    const diedAt = Date.now();
    const doneAtCrash = (await row(runId)).done;
    const b = server('B');
    await b.startWorkers();

    const taken = await until('B to take the run again', async () => {
      const c = await claim(runId);
      return c.attempt === 2 ? c : null;
    });
    expect(taken.server).toBe('B');
    expect(Date.now() - diedAt).toBeGreaterThanOrEqual((EXPIRE_S - 1) * 1000); // not before the queue's expiry
    const ended = await until('B to end the run', async () => {
      const r = await row(runId);
      return r.finishedAt ? r : null;
    });
    // B ran it from the start to its time limit: its own figures, none of A's
    expect(ended.status).toBe('timed-out');
    expect(ended.error).toBeNull();
    const result = JSON.parse(ended.result);
    expect(result.iterations).toBe(ended.done);
    expect(ended.done).toBeGreaterThan(0);
    expect((await claim(runId)).attempt).toBe(2);
    expect(doneAtCrash).toBeGreaterThan(0);
    // A's workers stopped with the crash and wrote nothing over B's end
    await new Promise((r) => setTimeout(r, 500));
    expect(await row(runId)).toMatchObject({ status: 'timed-out', done: ended.done, finishedAt: ended.finishedAt });
  });

  it('marks failed, once the expiry has passed, a run whose server stopped between writing its row and queueing it', async () => {
    const b = server('B');
    await b.startWorkers();
    const wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    const id = '00000000-0000-4000-8000-00000000a001';
    const at = (msAgo: number) => new Date(Date.now() - msAgo).toISOString();
    await k('monte_carlo_runs').insert({ id, workspaceId: wsId, caseId: Number(params.id), spec: JSON.stringify(body(1000, 1)), status: 'running', iterations: 1000, done: 0, createdBy: ids['analyst@aldervane.test'], createdAt: at(1000) });
    await k('monte_carlo_run_claims').insert({ runId: id });
    // within the expiry it may still be on its way: left running
    expect((await on(b, () => call(getRoute, { ...params, job: id }))).body.run).toMatchObject({ status: 'running', finishedAt: null });
    await k('monte_carlo_runs').where({ id }).update({ createdAt: at((EXPIRE_S + 1) * 1000) });
    expect((await on(b, () => call(getRoute, { ...params, job: id }))).body.run).toMatchObject({ status: 'failed', error: NEVER_QUEUED });
    expect((await row(id)).finishedAt).toBeTruthy();
  });

  it('marks failed, after the expiry, a run whose server died when no retry is left', async () => {
    process.env.HAULCASE_MC_TIME_LIMIT_MS = '2000';
    process.env.HAULCASE_MC_QUEUE_RETRIES = '0';
    const a = server('A');
    await a.startWorkers();
    const runId = (await on(a, () => call(startRoute, params, { body: body(100_000, 12) }))).body.run.id;
    await until('A to write progress', async () => (await row(runId)).done > 0);
    a.simulateCrash();
    const diedAt = Date.now();
    const b = server('B');
    await b.startWorkers();
    const r = await until('the run to be marked failed', async () => {
      const got = (await on(b, () => call(getRoute, { ...params, job: runId }))).body.run;
      return got.finishedAt ? got : null;
    });
    expect(Date.now() - diedAt).toBeGreaterThanOrEqual((EXPIRE_S - 1) * 1000); // not before the queue's expiry
    expect(r).toMatchObject({ status: 'failed', error: RUN_LOST, result: null });
    expect((await claim(runId)).attempt).toBe(1); // never taken again
    expect(b.holding()).toEqual([]);
  });
});
