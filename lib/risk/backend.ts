import 'server-only';
/**
 * Who runs Monte Carlo runs. The routes (through lib/risk/runs.ts) call one
 * small interface and do not know which backend answers:
 *
 * - **in-process** (SQLite, the single-machine demo): the run lives in this
 *   server's worker threads (lib/risk/jobs.ts); progress and cancel reach it in
 *   memory, the row keeps what it was asked and found.
 * - **queue** (PostgreSQL, `DATABASE_URL` set): the route enqueues the run on
 *   pg-boss and answers at once; any server's worker takes it and runs it in its
 *   worker threads with the same engine code; progress, the cancel flag and the
 *   result are written to the database, so a poll or a cancel reaching any
 *   server works (lib/risk/backends/queue.ts).
 */
import { env } from '@/lib/env';
import type { MonteCarloResult } from '@/lib/engine/monte-carlo';
import type { RunView, StartRunInput } from './run-rows';
import { inProcessBackend } from './backends/in-process';
import { queueBackendFromEnv } from './backends/queue';

export interface JobBackend {
  readonly kind: 'in-process' | 'queue';
  /** Write the row and its audit entry, then run it or enqueue it; answers at once with the run (status running). */
  start(o: StartRunInput): Promise<RunView>;
  /** The run of this workspace's case with its progress, and its result once finished; 404 otherwise. */
  progress(workspaceId: number, caseId: number, runId: string): Promise<RunView>;
  /** The result of a finished run (null while it runs or when none was found); 404 for an unknown run. */
  result(workspaceId: number, caseId: number, runId: string): Promise<MonteCarloResult | null>;
  /** Ask a running run to stop (the iterations done are summarised); 409 when it has finished. Audited. */
  cancel(o: { workspaceId: number; caseId: number; runId: string; userId: number }): Promise<RunView>;
  /** The case's latest runs, newest first, without their results. */
  list(workspaceId: number, caseId: number, limit?: number): Promise<Omit<RunView, 'result'>[]>;
}

let forTests: JobBackend | null = null;

/** Tests: answer the routes with this backend (one of two queue backends standing for two servers); null: as configured. */
export function useRunBackendForTests(backend: JobBackend | null): void {
  forTests = backend;
}

/** The backend of this server: the queue with PostgreSQL (`DATABASE_URL`), else the in-process pool. */
export function runBackend(): JobBackend {
  if (forTests) return forTests;
  return env().DATABASE_URL ? queueBackendFromEnv() : inProcessBackend;
}
