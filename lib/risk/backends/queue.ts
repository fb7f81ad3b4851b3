import 'server-only';
/**
 * The queue backend (PostgreSQL, several app servers): Monte Carlo runs go
 * through pg-boss, the npm job queue on PostgreSQL, in the app's own database
 * (schema `pgboss`, which pg-boss creates and migrates itself).
 *
 * - **Start** (any server): the run's row, its claim row
 *   (`monte_carlo_run_claims`, migration 0020) and the audit entry in one
 *   transaction, then the job is sent (job id = run id) and the route answers
 *   at once, the run `running` with nothing done yet.
 * - **Work** (every server): `HAULCASE_MC_MAX_RUNNING` pg-boss workers of one
 *   job each, so a server never runs more at once. A worker claims the run
 *   (the claim's `attempt` counted up), runs it in this server's worker threads
 *   with the same engine code as the in-process backend (lib/risk/jobs.ts),
 *   writes `done` and a heartbeat every half second, reads the cancel flag
 *   with each write, and writes the end (done, cancelled, timed out, failed)
 *   with the result. Every write names the attempt, so a server that lost the
 *   run never writes over the one that has it.
 * - **Progress, result, cancel** (any server): read from the rows; a cancel sets
 *   the flag (the holder stops its workers at its next write) or, for a run no
 *   server has taken yet, ends it at once.
 * - **A server that dies**: its job stays active until the queue's expiry
 *   (`HAULCASE_MC_QUEUE_EXPIRE_S`, longer than the run time limit); the queue's
 *   maintenance, on whichever server runs it, then hands the job to another
 *   server (`HAULCASE_MC_QUEUE_RETRIES` times: the run starts again from its
 *   seed, so it finds the same figures) and, when no retry is left, to the
 *   dead-letter queue, whose worker marks the run failed with the reason. No
 *   run is left `running`.
 */
import os from 'node:os';
import { randomUUID } from 'node:crypto';
import pg from 'pg';
import PgBoss from 'pg-boss';
import type { Knex } from 'knex';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { env } from '@/lib/env';
import { HttpError, notFound } from '@/lib/http';
import { nowIso } from '@/lib/time';
import type { CaseFileInput } from '@/lib/validation/case';
import type { JobBackend } from '../backend';
import { cancelJob, getJob, newJobRegistry, startJob, whenFinished, type JobView } from '../jobs';
import { endColumns, fetchRunRow, fromRow, insertRunRow, runsWithAuthor, type RunEnd, type RunView, type Row } from '../run-rows';

export const QUEUE = 'haulcase-monte-carlo';
/** Where the queue puts a run whose attempts all expired or failed; its worker marks the run failed. */
export const LOST_QUEUE = 'haulcase-monte-carlo-lost';

/** What a run whose server stopped (and whose retries, if any, did too) records. */
export const RUN_LOST = 'The run stopped before it finished: the server running it stopped or lost the database, and the job queue ended it at its expiry. Start the run again.';
/** What a run whose job never reached the queue records (its server stopped between the row and the send). */
export const NEVER_QUEUED = 'The run never reached the job queue (its server stopped as it started the run). Start the run again.';
/** What a run cancelled before any server took it records. */
export const CANCELLED_QUEUED = 'Cancelled before a server took it from the queue.';
/** The advisory lock servers take in turn to set the queue up. */
const SETUP_LOCK = 0x4843_4d43; // "HCMC"
/** Unfinished runs a workspace may have queued at once. */
export const QUEUED_LIMIT = 50;

interface JobData {
  runId: string;
  /** the case as validated when the run was asked: the run uses it, whatever the case becomes */
  caseFile: CaseFileInput;
}

export interface QueueBackendOptions {
  connectionString: string;
  /** the app's Knex instance (read at each call: tests point it elsewhere) */
  db?: () => Knex;
  /** this server's name in the claim rows; default host:pid */
  server?: string;
  /** runs at once on this server; default HAULCASE_MC_MAX_RUNNING */
  maxRunning?: number;
  /** the queue's expiry in seconds; default HAULCASE_MC_QUEUE_EXPIRE_S */
  expireSeconds?: number;
  /** attempts after the first when a server stops; default HAULCASE_MC_QUEUE_RETRIES */
  retries?: number;
  /** how often an idle worker asks the queue for a run, seconds (at least 0.5); default 1 */
  pollSeconds?: number;
  /** how often a running run writes its progress and reads the cancel flag; default 500 ms */
  progressMs?: number;
  /** worker threads per run; default HAULCASE_MC_WORKERS */
  workers?: number;
}

export interface QueueBackend extends JobBackend {
  readonly kind: 'queue';
  readonly server: string;
  /** Start taking runs from the queue (idempotent). */
  startWorkers(): Promise<void>;
  /** Stop taking runs; runs held here go back to the queue for another server. */
  stop(): Promise<void>;
  /** Runs this server holds now. */
  holding(): string[];
  /** Resolves when this server's attempt at the run has ended (null when it holds none). */
  whenReleased(runId: string): Promise<void> | null;
  /** Tests: this server dies now: it writes nothing more, answers the queue nothing more, and its workers stop. */
  simulateCrash(): void;
}

export function createQueueBackend(o: QueueBackendOptions): QueueBackend {
  const k = o.db ?? db;
  const server = o.server ?? `${os.hostname()}:${process.pid}`;
  const settings = () => {
    const e = env();
    return {
      expire: o.expireSeconds ?? e.HAULCASE_MC_QUEUE_EXPIRE_S,
      retries: o.retries ?? e.HAULCASE_MC_QUEUE_RETRIES,
      maxRunning: o.maxRunning ?? e.HAULCASE_MC_MAX_RUNNING,
    };
  };
  const registry = newJobRegistry();
  const released = new Map<string, Promise<void>>();
  /** dead: a crash (tests); stopping: runs held here are given back, so nothing more is written for them */
  let dead = false;
  let stopping = false;

  const pool = new pg.Pool({ connectionString: o.connectionString, max: 4, application_name: 'haulcase-queue' });
  pool.on('error', (err) => console.error('[haulcase] job queue connection error:', err.message));
  const never = new Promise<never>(() => {});
  // pg-boss talks to the database through this, so a simulated crash can silence it mid-run
  const adapter = { executeSql: (text: string, values?: unknown[]) => (dead ? never : pool.query(text, values as unknown[])) };
  const expire0 = settings().expire;
  const boss = new PgBoss({
    db: adapter,
    schema: 'pgboss',
    schedule: false,
    // the expiry is checked by the maintenance, which one server at a time runs per interval
    maintenanceIntervalSeconds: Math.max(1, Math.min(60, Math.floor(expire0 / 3))),
    monitorStateIntervalSeconds: 600,
  });
  boss.on('error', (err) => {
    if (!dead) console.error('[haulcase] job queue error:', err instanceof Error ? err.message : err);
  });

  let started: Promise<void> | null = null;
  const ready = () =>
    (started ??= (async () => {
      const s = settings();
      // servers starting together take turns (pg-boss's own set-up and queue creation can deadlock each other)
      const lock = await pool.connect();
      try {
        await lock.query('select pg_advisory_lock($1)', [SETUP_LOCK]);
        await boss.start();
        if (!(await boss.getQueue(LOST_QUEUE))) await boss.createQueue(LOST_QUEUE, { name: LOST_QUEUE, policy: 'standard' });
        if (!(await boss.getQueue(QUEUE))) {
          await boss.createQueue(QUEUE, { name: QUEUE, policy: 'standard', retryLimit: s.retries, retryDelay: 0, expireInSeconds: s.expire, deadLetter: LOST_QUEUE });
        }
      } finally {
        await lock.query('select pg_advisory_unlock($1)', [SETUP_LOCK]).catch(() => undefined);
        lock.release();
      }
    })());
  ready().catch(() => (started = null)); // connect now; a failure is retried by the next call

  let working: Promise<void> | null = null;
  /** this server's pg-boss workers on the run queue: a start wakes them, so an idle one here takes the run without waiting for its next poll */
  const workerIds: string[] = [];

  /** Writes of one attempt: only while the run is unfinished and the attempt is still this one. */
  const writeAttempt = (runId: string, attempt: number, cols: Record<string, unknown>): Promise<number> => {
    if (dead || stopping) return Promise.resolve(0);
    return k()('monte_carlo_runs')
      .where({ id: runId })
      .whereNull('finishedAt')
      .whereExists(function () {
        this.select(k().raw('1')).from('monte_carlo_run_claims').where({ runId, attempt });
      })
      .update(cols);
  };

  async function take(job: PgBoss.Job<JobData>): Promise<void> {
    const { runId, caseFile } = job.data;
    const [row, claim] = await Promise.all([
      k()('monte_carlo_runs').where({ id: runId }).first('id', 'workspaceId', 'caseId', 'spec', 'finishedAt'),
      k()('monte_carlo_run_claims').where({ runId }).first(),
    ]);
    if (!row || !claim || row.finishedAt) return; // cancelled while queued, or ended by an earlier attempt
    const attempt = Number(claim.attempt) + 1;
    const at = nowIso();
    const took = await k()('monte_carlo_run_claims').where({ runId, attempt: claim.attempt }).update({ attempt, server, claimedAt: at, heartbeatAt: at });
    if (took !== 1) return; // another server took it meanwhile
    if (claim.cancelRequested) {
      await writeAttempt(runId, attempt, endColumns({ status: 'cancelled', done: 0, result: null, error: null, finishedAt: nowIso() }));
      return;
    }
    // an earlier attempt's progress starts over (same seed: same figures)
    await writeAttempt(runId, attempt, { done: 0 });

    let release!: () => void;
    released.set(runId, new Promise<void>((r) => (release = r)));
    let lastDone = 0;
    let ticking = false;
    const tick = setInterval(() => {
      if (ticking || dead || stopping) return;
      ticking = true;
      void (async () => {
        const live = getJob(runId, registry);
        if (live && live.status === 'running' && live.done !== lastDone) {
          lastDone = live.done;
          await writeAttempt(runId, attempt, { done: live.done });
        }
        await k()('monte_carlo_run_claims').where({ runId, attempt }).update({ heartbeatAt: nowIso() });
        const c = await k()('monte_carlo_run_claims').where({ runId }).first('cancelRequested', 'attempt');
        // cancelled on some server, or the run was given to another server: stop the workers
        if (!c || c.cancelRequested || Number(c.attempt) !== attempt) cancelJob(runId, registry);
      })()
        .catch((err) => console.error('[haulcase] writing Monte Carlo progress failed:', err instanceof Error ? err.message : err))
        .finally(() => (ticking = false));
    }, o.progressMs ?? 500);

    const end = async (j: Pick<JobView, 'status' | 'done' | 'result' | 'error' | 'finishedAt'>) => {
      clearInterval(tick);
      await writeAttempt(runId, attempt, endColumns(j as RunEnd));
    };
    try {
      startJob(
        { id: runId, workspaceId: row.workspaceId, caseId: row.caseId, validCase: caseFile, spec: JSON.parse(row.spec), workers: o.workers, onFinish: end },
        registry,
        settings().maxRunning,
      );
      await whenFinished(runId, registry);
    } catch (err) {
      await end({ status: 'failed', done: 0, result: null, error: 'The run could not start.', finishedAt: nowIso() });
      console.error('[haulcase] a queued Monte Carlo run could not start:', err);
    } finally {
      clearInterval(tick);
      released.delete(runId);
      release();
    }
    if (dead) await never; // a dead server tells the queue nothing: the expiry finds the job
    // a server shutting down gives the run back: a failed attempt is retried on another server
    if (stopping) throw new Error('The server stopped; the run goes back to the queue.');
  }

  /** A run whose attempts all ended without an end written: failed, with the reason. */
  async function markLost(jobs: PgBoss.Job<JobData>[]): Promise<void> {
    for (const job of jobs) {
      await k()('monte_carlo_runs').where({ id: job.data.runId }).whereNull('finishedAt').update({ status: 'failed', error: RUN_LOST, finishedAt: nowIso() });
    }
  }

  async function progress(workspaceId: number, caseId: number, runId: string): Promise<RunView> {
    const run = await fetchRunRow(k(), workspaceId, caseId, runId);
    if (!run) throw notFound('No such Monte Carlo run.');
    if (!run.finishedAt && Date.parse(run.createdAt) < Date.now() - settings().expire * 1000 && (await neverQueued(runId))) {
      // its server stopped between writing the row and sending the job: no queue will ever end it
      await k()('monte_carlo_runs').where({ id: runId }).whereNull('finishedAt').update({ status: 'failed', error: NEVER_QUEUED, finishedAt: nowIso() });
      return (await fetchRunRow(k(), workspaceId, caseId, runId)) ?? run;
    }
    return run;
  }

  /** No server ever took the run and the queue has no job for it. */
  async function neverQueued(runId: string): Promise<boolean> {
    const c = await k()('monte_carlo_run_claims').where({ runId }).first('attempt');
    if (!c || Number(c.attempt) !== 0) return false;
    await ready();
    return (await boss.getJobById(QUEUE, runId, { includeArchive: true })) === null;
  }

  return {
    kind: 'queue',
    server,

    async startWorkers() {
      working ??= (async () => {
        await ready();
        const poll = { pollingIntervalSeconds: o.pollSeconds ?? 1 };
        // one job per worker: at most HAULCASE_MC_MAX_RUNNING runs at once on this server
        for (let i = 0; i < settings().maxRunning; i++) {
          workerIds.push(await boss.work<JobData>(QUEUE, { ...poll, batchSize: 1 }, async ([job]) => take(job)));
        }
        await boss.work<JobData>(LOST_QUEUE, { ...poll, batchSize: 10 }, markLost);
      })();
      working.catch(() => (working = null));
      return working;
    },

    async stop() {
      if (dead) {
        void boss.stop({ graceful: false, wait: false, close: false }).catch(() => undefined);
        await pool.end().catch(() => undefined);
        return;
      }
      stopping = true;
      for (const id of [...released.keys()]) cancelJob(id, registry);
      if (started) await boss.stop({ graceful: true, wait: true, timeout: 10_000 }).catch(() => undefined); // active jobs fail back to the queue
      await pool.end().catch(() => undefined);
    },

    holding: () => [...released.keys()],
    whenReleased: (runId) => released.get(runId) ?? null,

    simulateCrash() {
      dead = true;
      for (const id of [...released.keys()]) cancelJob(id, registry); // the threads die with the process
    },

    async start(input) {
      await ready();
      const s = settings();
      const open = await k()('monte_carlo_runs').where({ workspaceId: input.workspaceId }).whereNull('finishedAt').count({ n: '*' }).first();
      if (Number(open?.n ?? 0) >= QUEUED_LIMIT) {
        throw new HttpError(429, `This workspace already has ${QUEUED_LIMIT} Monte Carlo runs queued or running; try again when some finish.`);
      }
      const id = randomUUID();
      await k().transaction(async (trx) => {
        await insertRunRow(trx, { ...input, id, createdAt: nowIso() });
        await trx('monte_carlo_run_claims').insert({ runId: id });
      });
      try {
        const data: JobData = { runId: id, caseFile: input.caseFile as CaseFileInput };
        const sent = await boss.send(QUEUE, data, { id, retryLimit: s.retries, retryDelay: 0, expireInSeconds: s.expire, deadLetter: LOST_QUEUE });
        if (!sent) throw new Error('the queue refused the job');
        for (const w of workerIds) boss.notifyWorker(w);
      } catch (err) {
        await k()('monte_carlo_runs').where({ id }).whereNull('finishedAt').update({ status: 'failed', error: 'The run could not be queued.', finishedAt: nowIso() });
        throw err;
      }
      return progress(input.workspaceId, input.caseId, id);
    },

    progress,

    async result(workspaceId, caseId, runId) {
      const run = await progress(workspaceId, caseId, runId);
      return run.finishedAt ? run.result : null;
    },

    async cancel(c) {
      const run = await progress(c.workspaceId, c.caseId, c.runId);
      if (run.status !== 'running') throw new HttpError(409, `The run has already finished (${run.status}).`);
      const finishedAt = nowIso();
      const outcome = await k().transaction(async (trx) => {
        const row = await trx('monte_carlo_runs').where({ id: c.runId }).forUpdate().first('finishedAt');
        if (!row || row.finishedAt) return 'finished' as const;
        await trx('monte_carlo_run_claims').where({ runId: c.runId }).update({ cancelRequested: true });
        // a run no server has taken yet ends now; a taken one stops at its holder's next progress write
        const queued = await trx('monte_carlo_runs')
          .where({ id: c.runId })
          .whereNull('finishedAt')
          .whereExists(function () {
            this.select(trx.raw('1')).from('monte_carlo_run_claims').where({ runId: c.runId, attempt: 0 });
          })
          .update({ status: 'cancelled', error: CANCELLED_QUEUED, finishedAt });
        await writeAudit(trx, { workspaceId: c.workspaceId, userId: c.userId, action: 'cancel', entity: 'monte_carlo_run', entityId: c.runId, after: queued ? { reason: CANCELLED_QUEUED } : undefined });
        return queued === 1 ? ('queued' as const) : ('taken' as const);
      });
      if (outcome === 'finished') return progress(c.workspaceId, c.caseId, c.runId); // it finished meanwhile: show how
      if (outcome === 'queued') {
        await boss.cancel(QUEUE, c.runId).catch((err) => console.error('[haulcase] cancelling a queued job failed:', err));
        return { ...run, status: 'cancelled', error: CANCELLED_QUEUED, finishedAt };
      }
      return { ...run, status: 'cancelled' };
    },

    async list(workspaceId, caseId, limit = 10) {
      const rows = await runsWithAuthor(k()).where({ 'r.workspaceId': workspaceId, 'r.caseId': caseId }).orderBy('r.createdAt', 'desc').limit(limit);
      return rows.map((r: Row) => {
        const { result: _omit, ...rest } = fromRow({ ...r, result: null }); // eslint-disable-line @typescript-eslint/no-unused-vars
        return rest;
      });
    },
  };
}

const holder = globalThis as unknown as { __haulcaseQueue?: { url: string; backend: QueueBackend } };

/**
 * This server's queue backend, on `DATABASE_URL` (one per process and URL, on
 * globalThis: the start-up hook and the route handlers may load separate copies
 * of this module).
 */
export function queueBackendFromEnv(): QueueBackend {
  const url = env().DATABASE_URL;
  if (!url) throw new Error('The job queue needs DATABASE_URL (PostgreSQL).');
  if (holder.__haulcaseQueue?.url === url) return holder.__haulcaseQueue.backend;
  const backend = createQueueBackend({ connectionString: url });
  holder.__haulcaseQueue = { url, backend };
  return backend;
}
