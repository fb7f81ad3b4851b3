import 'server-only';
/**
 * In-process Monte Carlo job manager: splits a run's iterations across worker
 * threads, tracks progress, stops on cancel or at the time limit, and keeps
 * the summaries the workers make of the iterations done. Jobs are keyed
 * by a random id; the registry lives on globalThis so hot reloads keep it.
 * Persisting a run's row is the caller's business (lib/risk/runs.ts), through
 * the onFinish hook, so this module stays free of the database.
 */
import { randomUUID } from 'node:crypto';
import path from 'node:path';
import type { Worker } from 'node:worker_threads';
import type { MonteCarloResult, MonteCarloSpec } from '@/lib/engine/monte-carlo';
import type { CaseFileInput } from '@/lib/validation/case';
import { runInWorkers } from './pool';
import { env } from '@/lib/env';

export type JobStatus = 'running' | 'done' | 'cancelled' | 'timed-out' | 'failed';

export interface JobView {
  id: string;
  workspaceId: number;
  caseId: number;
  status: JobStatus;
  iterations: number;
  done: number;
  startedAt: string;
  finishedAt: string | null;
  error: string | null;
  result: MonteCarloResult | null;
}

interface Job extends JobView {
  stop: Int32Array;
  workers: Worker[];
  timer: NodeJS.Timeout | null;
  finished: Promise<JobView>;
}

export interface StartOptions {
  /** default: a new random UUID */
  id?: string;
  workspaceId: number;
  caseId: number;
  validCase: CaseFileInput;
  spec: MonteCarloSpec;
  /** default HAULCASE_MC_TIME_LIMIT_MS or 120 s */
  timeLimitMs?: number;
  /** default HAULCASE_MC_WORKERS or 2 */
  workers?: number;
  /** the number of iterations done so far, as the workers report it */
  onProgress?: (done: number) => void;
  onFinish?: (job: JobView) => Promise<void> | void;
}

/** At most this many runs at once per server: each takes every worker it has. */
export const MAX_RUNNING = env().HAULCASE_MC_MAX_RUNNING;
/** Finished jobs stay in memory this long (their result is also in the database). */
const KEEP_FINISHED_MS = 30 * 60_000;

const holder = globalThis as unknown as { __haulcaseMcJobs?: Map<string, Job> };
const jobs = (holder.__haulcaseMcJobs ??= new Map<string, Job>());

/**
 * The jobs one holder runs. The in-process backend uses the server's own (on
 * globalThis); a queue backend keeps its own, so two of them in one test
 * process stand for two servers, each with its own limit.
 */
export type JobRegistry = Map<string, Job>;
export function newJobRegistry(): JobRegistry {
  return new Map<string, Job>();
}

export class TooManyRunsError extends Error {}

/** The bundled worker: HAULCASE_MC_WORKER, else .haulcase/mc-worker.cjs from the app's folder. */
export function workerBundlePath(): string {
  return env().HAULCASE_MC_WORKER ?? path.join(process.cwd(), '.haulcase', 'mc-worker.cjs');
}

export function view(job: Job | JobView): JobView {
  const { id, workspaceId, caseId, status, iterations, done, startedAt, finishedAt, error, result } = job;
  return { id, workspaceId, caseId, status, iterations, done, startedAt, finishedAt, error, result };
}

export function getJob(id: string, registry: JobRegistry = jobs): JobView | null {
  const j = registry.get(id);
  return j ? view(j) : null;
}

export function runningCount(registry: JobRegistry = jobs): number {
  let n = 0;
  for (const j of registry.values()) if (j.status === 'running') n++;
  return n;
}

/** Ask a running job to stop; the iterations done so far are summarised. */
export function cancelJob(id: string, registry: JobRegistry = jobs): boolean {
  const j = registry.get(id);
  if (!j || j.status !== 'running') return false;
  j.status = 'cancelled';
  Atomics.store(j.stop, 0, 1);
  return true;
}

/** Resolves when the job has finished (done, cancelled, timed out or failed). */
export function whenFinished(id: string, registry: JobRegistry = jobs): Promise<JobView> | null {
  return registry.get(id)?.finished ?? null;
}

export function startJob(o: StartOptions, registry: JobRegistry = jobs, maxRunning = MAX_RUNNING): JobView {
  if (runningCount(registry) >= maxRunning) throw new TooManyRunsError('Too many Monte Carlo runs in progress on this server; try again when one finishes.');
  const bundle = workerBundlePath();
  const total = o.spec.iterations;
  const count = o.workers ?? env().HAULCASE_MC_WORKERS;
  const stopBuffer = new SharedArrayBuffer(4);
  const job: Job = {
    id: o.id ?? randomUUID(), workspaceId: o.workspaceId, caseId: o.caseId, status: 'running', iterations: total, done: 0,
    startedAt: new Date().toISOString(), finishedAt: null, error: null, result: null,
    stop: new Int32Array(stopBuffer), workers: [], timer: null, finished: Promise.resolve(null as unknown as JobView),
  };
  const pool = runInWorkers(bundle, o.validCase, o.spec, {
    workers: count,
    stop: stopBuffer,
    keepNpvs: false, // the job keeps only the summaries
    onProgress: (done) => {
      job.done = done;
      o.onProgress?.(done);
    },
  });
  job.workers = pool.workers;
  job.timer = setTimeout(() => {
    if (job.status !== 'running') return;
    job.status = 'timed-out';
    Atomics.store(job.stop, 0, 1);
  }, o.timeLimitMs ?? env().HAULCASE_MC_TIME_LIMIT_MS);

  job.finished = pool.finished
    .then(({ done, result }) => {
      job.done = done;
      job.result = result; // summarised by the workers, off the request thread
      if (job.status === 'running') job.status = 'done';
    })
    .catch((err: unknown) => {
      job.status = 'failed';
      job.error = err instanceof Error ? err.message : String(err);
      for (const w of job.workers) void w.terminate();
    })
    .then(async () => {
      if (job.timer) clearTimeout(job.timer);
      job.finishedAt = new Date().toISOString();
      job.workers = [];
      try {
        await o.onFinish?.(view(job));
      } catch (err) {
        console.error('[haulcase] saving a Monte Carlo run failed:', err);
      }
      setTimeout(() => registry.delete(job.id), KEEP_FINISHED_MS).unref();
      return view(job);
    });
  registry.set(job.id, job);
  return view(job);
}
