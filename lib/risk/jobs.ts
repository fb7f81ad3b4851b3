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
  onFinish?: (job: JobView) => Promise<void> | void;
}

/** At most this many runs at once per server: each takes every worker it has. */
export const MAX_RUNNING = env().HAULCASE_MC_MAX_RUNNING;
/** Finished jobs stay in memory this long (their result is also in the database). */
const KEEP_FINISHED_MS = 30 * 60_000;

const holder = globalThis as unknown as { __haulcaseMcJobs?: Map<string, Job> };
const jobs = (holder.__haulcaseMcJobs ??= new Map<string, Job>());

export class TooManyRunsError extends Error {}

/** The bundled worker: HAULCASE_MC_WORKER, else .haulcase/mc-worker.cjs from the app's folder. */
export function workerBundlePath(): string {
  return env().HAULCASE_MC_WORKER ?? path.join(process.cwd(), '.haulcase', 'mc-worker.cjs');
}

export function view(job: Job | JobView): JobView {
  const { id, workspaceId, caseId, status, iterations, done, startedAt, finishedAt, error, result } = job;
  return { id, workspaceId, caseId, status, iterations, done, startedAt, finishedAt, error, result };
}

export function getJob(id: string): JobView | null {
  const j = jobs.get(id);
  return j ? view(j) : null;
}

export function runningCount(): number {
  let n = 0;
  for (const j of jobs.values()) if (j.status === 'running') n++;
  return n;
}

/** Ask a running job to stop; the iterations done so far are summarised. */
export function cancelJob(id: string): boolean {
  const j = jobs.get(id);
  if (!j || j.status !== 'running') return false;
  j.status = 'cancelled';
  Atomics.store(j.stop, 0, 1);
  return true;
}

/** Resolves when the job has finished (done, cancelled, timed out or failed). */
export function whenFinished(id: string): Promise<JobView> | null {
  return jobs.get(id)?.finished ?? null;
}

export function startJob(o: StartOptions): JobView {
  if (runningCount() >= MAX_RUNNING) throw new TooManyRunsError('Too many Monte Carlo runs in progress on this server; try again when one finishes.');
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
    onProgress: (done) => (job.done = done),
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
      setTimeout(() => jobs.delete(job.id), KEEP_FINISHED_MS).unref();
      return view(job);
    });
  jobs.set(job.id, job);
  return view(job);
}
