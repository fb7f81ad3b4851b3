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
import { cancelJob, getJob, MAX_RUNNING, runningCount, startJob, TooManyRunsError, type JobView } from './jobs';

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
    await db()('monte_carlo_runs')
      .where({ id })
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

export async function cancelRun(o: { workspaceId: number; caseId: number; runId: string; userId: number }): Promise<RunView> {
  const run = await readRun(o.workspaceId, o.caseId, o.runId);
  if (run.status !== 'running') throw new HttpError(409, `The run has already finished (${run.status}).`);
  if (!cancelJob(o.runId)) throw new HttpError(409, 'The run is not in progress on this server.');
  await writeAudit(db(), { workspaceId: o.workspaceId, userId: o.userId, action: 'cancel', entity: 'monte_carlo_run', entityId: o.runId });
  return { ...run, status: 'cancelled' };
}
