import 'server-only';
/**
 * Monte Carlo runs: start one for a business case (row + audit in one
 * transaction, then the workers), read one (live progress from this server's
 * job manager, else the stored row), cancel one.
 */
import { randomUUID } from 'node:crypto';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { HttpError, notFound } from '@/lib/http';
import { nowIso } from '@/lib/time';
import type { MonteCarloResult } from '@/lib/engine/monte-carlo';
import type { CaseFile } from '@/lib/validation/case';
import type { MonteCarloRequest } from '@/lib/validation/risk';
import type { Knex } from 'knex';
import { fleetSummary, MEASURE_LABELS, runMeasure, type FleetMeasure } from './measures';
import { cancelJob, getJob, MAX_RUNNING, runningCount, startJob, TooManyRunsError, type JobView } from './jobs';

/** Why a run left `running` by an earlier server process is failed when a server starts. */
export const INTERRUPTED_BY_RESTART = 'Interrupted by a server restart; start the run again.';
/** What a cancel of a run that no server holds any more records. */
export const CANCELLED_NOT_RUNNING = 'Cancelled: the run was no longer in progress on this server (interrupted by a restart).';

export interface RunView {
  id: string;
  caseId: number;
  status: JobView['status'];
  iterations: number;
  done: number;
  spec: MonteCarloRequest;
  createdAt: string;
  finishedAt: string | null;
  error: string | null;
  result: MonteCarloResult | null;
}

type Row = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any -- a knex row

function fromRow(row: Row): RunView {
  return {
    id: row.id,
    caseId: row.caseId,
    status: row.status,
    iterations: row.iterations,
    done: row.done,
    spec: JSON.parse(row.spec),
    createdAt: row.createdAt,
    finishedAt: row.finishedAt,
    error: row.error,
    result: row.result ? JSON.parse(row.result) : null,
  };
}

export async function startRun(o: { workspaceId: number; caseId: number; userId: number; caseFile: CaseFile; spec: MonteCarloRequest }): Promise<RunView> {
  if (runningCount() >= MAX_RUNNING) throw new HttpError(429, 'Too many Monte Carlo runs in progress on this server; try again when one finishes.');
  const id = randomUUID();
  const createdAt = nowIso();
  // the row and its audit first, in one transaction, so the job's finish always has a row to update
  await db().transaction(async (trx) => {
    await trx('monte_carlo_runs').insert({
      id, workspaceId: o.workspaceId, caseId: o.caseId, spec: JSON.stringify(o.spec), status: 'running',
      iterations: o.spec.iterations, done: 0, createdBy: o.userId, createdAt,
    });
    await writeAudit(trx, {
      workspaceId: o.workspaceId, userId: o.userId, action: 'run', entity: 'monte_carlo_run', entityId: id,
      after: { caseId: o.caseId, ...o.spec },
    });
  });
  const finish = async (j: Pick<JobView, 'status' | 'done' | 'result' | 'error' | 'finishedAt'>): Promise<void> => {
    // the first recorded end wins (a run marked cancelled or interrupted keeps that)
    await db()('monte_carlo_runs')
      .where({ id })
      .whereNull('finishedAt')
      .update({ status: j.status, done: j.done, result: j.result ? JSON.stringify(j.result) : null, error: j.error, finishedAt: j.finishedAt });
  };
  try {
    startJob({ id, workspaceId: o.workspaceId, caseId: o.caseId, validCase: o.caseFile, spec: o.spec, onFinish: finish });
  } catch (err) {
    await finish({ status: 'failed', done: 0, result: null, error: 'The run could not start.', finishedAt: nowIso() });
    if (err instanceof TooManyRunsError) throw new HttpError(429, err.message);
    throw err;
  }
  return readRun(o.workspaceId, o.caseId, id);
}

/** A run of this workspace's case, with live progress when it runs on this server; 404 otherwise. */
export async function readRun(workspaceId: number, caseId: number, runId: string): Promise<RunView> {
  const row = await db()('monte_carlo_runs').where({ id: runId, workspaceId, caseId }).first();
  if (!row) throw notFound('No such Monte Carlo run.');
  const stored = fromRow(row);
  const live = getJob(runId);
  if (!live || stored.finishedAt) return stored;
  return { ...stored, status: live.status, done: live.done, result: live.result, error: live.error, finishedAt: live.finishedAt };
}

/** The case's latest runs, newest first, without their results. */
export async function listRuns(workspaceId: number, caseId: number, limit = 10): Promise<Omit<RunView, 'result'>[]> {
  const rows = await db()('monte_carlo_runs').where({ workspaceId, caseId }).orderBy('createdAt', 'desc').limit(limit);
  return rows.map((r: Row) => {
    const { result: _omit, ...rest } = fromRow({ ...r, result: null }); // eslint-disable-line @typescript-eslint/no-unused-vars
    const live = getJob(r.id);
    return live && !r.finishedAt ? { ...rest, status: live.status, done: live.done } : rest;
  });
}

/**
 * A run lives in the worker threads of the server process that started it, so
 * a row still `running` when a server starts was interrupted by a restart: it
 * is marked failed (instrumentation.ts → lib/risk/startup.ts) rather than shown
 * running, and uncancellable, for ever. Runs this process holds are left alone.
 * Returns how many rows were marked.
 */
export async function failInterruptedRuns(k: Knex = db(), at = nowIso()): Promise<number> {
  const rows: Array<{ id: string }> = await k('monte_carlo_runs').where({ status: 'running' }).whereNull('finishedAt').select('id');
  const ids = rows.map((r) => r.id).filter((id) => getJob(id) === null);
  if (ids.length === 0) return 0;
  return k('monte_carlo_runs').whereIn('id', ids).where({ status: 'running' }).whereNull('finishedAt').update({ status: 'failed', error: INTERRUPTED_BY_RESTART, finishedAt: at });
}

/**
 * Cancel: the workers of a run this server holds stop at their next progress
 * tick. A run stored as running that no worker here holds (its server was
 * restarted) is marked cancelled at once, with the reason, instead of answering
 * 409 for ever.
 */
export async function cancelRun(o: { workspaceId: number; caseId: number; runId: string; userId: number }): Promise<RunView> {
  const run = await readRun(o.workspaceId, o.caseId, o.runId);
  if (run.status !== 'running') throw new HttpError(409, `The run has already finished (${run.status}).`);
  if (cancelJob(o.runId)) {
    await writeAudit(db(), { workspaceId: o.workspaceId, userId: o.userId, action: 'cancel', entity: 'monte_carlo_run', entityId: o.runId });
    return { ...run, status: 'cancelled' };
  }
  const finishedAt = nowIso();
  const marked = await db().transaction(async (trx) => {
    const n = await trx('monte_carlo_runs').where({ id: o.runId, status: 'running' }).whereNull('finishedAt').update({ status: 'cancelled', error: CANCELLED_NOT_RUNNING, finishedAt });
    if (n === 1) await writeAudit(trx, { workspaceId: o.workspaceId, userId: o.userId, action: 'cancel', entity: 'monte_carlo_run', entityId: o.runId, after: { reason: CANCELLED_NOT_RUNNING } });
    return n === 1;
  });
  if (!marked) return readRun(o.workspaceId, o.caseId, o.runId); // it finished meanwhile: show how
  return { ...run, status: 'cancelled', error: CANCELLED_NOT_RUNNING, finishedAt };
}

/** A pinned run as the decision summary and the frozen record quote it. */
export interface PinnedRun {
  id: string;
  caseId: number;
  /** what the run was asked, as stored (distributions, sampleFailures, iterations, seed, measure) */
  spec: MonteCarloRequest;
  iterations: number;
  seed: number;
  sampleFailures: boolean;
  distributions: MonteCarloRequest['distributions'];
  measure: { kind: FleetMeasure; label: string };
  /** who started it (null: the account has since been removed) */
  author: { id: number; name: string; email: string } | null;
  startedAt: string;
  finishedAt: string;
  /** the fleet figure of the measure, in the case's currency */
  summary: { mean: number; p10: number; p50: number; p90: number; probLoss: number };
}

/**
 * The run pinned to a case, when it is finished (`done`) and holds the figure
 * of its measure; null when none is pinned. `k` may be a transaction (the
 * submission and the freeze read it inside theirs).
 */
export async function fetchPinnedRun(caseId: number, k: Knex = db()): Promise<PinnedRun | null> {
  const row = await k('business_cases as c')
    .join('monte_carlo_runs as r', function () {
      this.on('r.id', '=', 'c.pinnedRunId').andOn('r.caseId', '=', 'c.id');
    })
    .leftJoin('users as u', 'u.id', 'r.createdBy')
    .where('c.id', caseId)
    .where('r.status', 'done')
    .select('r.*', 'u.id as authorId', 'u.name as authorName', 'u.email as authorEmail')
    .first();
  if (!row || !row.result) return null;
  const run = fromRow(row);
  const measure = runMeasure(run.spec);
  const s = run.result ? fleetSummary(run.result.fleet, measure) : null;
  if (!s) return null;
  return {
    id: run.id,
    caseId: run.caseId,
    spec: { ...run.spec, measure },
    iterations: run.result?.iterations ?? run.iterations,
    seed: run.spec.seed,
    sampleFailures: run.spec.sampleFailures,
    distributions: run.spec.distributions,
    measure: { kind: measure, label: MEASURE_LABELS[measure] },
    author: row.authorId == null ? null : { id: row.authorId, name: row.authorName ?? '', email: row.authorEmail ?? '' },
    startedAt: run.createdAt,
    finishedAt: run.finishedAt ?? run.createdAt,
    summary: { mean: s.mean, p10: s.p10, p50: s.p50, p90: s.p90, probLoss: s.probNegative },
  };
}
