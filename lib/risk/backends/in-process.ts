import 'server-only';
/**
 * The in-process backend (SQLite, the demo): a run lives in the worker threads
 * of the server that started it (lib/risk/jobs.ts). Live progress comes from
 * this server's job registry, the row keeps what the run was asked and found.
 * A run whose server restarted is failed at the next start
 * (`failInterruptedRuns` in lib/risk/runs.ts); this assumes one app server per
 * database.
 */
import { randomUUID } from 'node:crypto';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { HttpError, notFound } from '@/lib/http';
import { nowIso } from '@/lib/time';
import type { JobBackend } from '../backend';
import { cancelJob, getJob, MAX_RUNNING, runningCount, startJob, TooManyRunsError } from '../jobs';
import { endColumns, fetchRunRow, fromRow, insertRunRow, runsWithAuthor, type RunEnd, type RunView, type Row } from '../run-rows';

/** What a cancel of a run that no server holds any more records. */
export const CANCELLED_NOT_RUNNING = 'Cancelled: the run was no longer in progress on this server (interrupted by a restart).';

async function progress(workspaceId: number, caseId: number, runId: string): Promise<RunView> {
  const stored = await fetchRunRow(db(), workspaceId, caseId, runId);
  if (!stored) throw notFound('No such Monte Carlo run.');
  const live = getJob(runId);
  if (!live || stored.finishedAt) return stored;
  return { ...stored, status: live.status, done: live.done, result: live.result, error: live.error, finishedAt: live.finishedAt };
}

export const inProcessBackend: JobBackend = {
  kind: 'in-process',

  async start(o) {
    if (runningCount() >= MAX_RUNNING) throw new HttpError(429, 'Too many Monte Carlo runs in progress on this server; try again when one finishes.');
    const id = randomUUID();
    // the row and its audit first, in one transaction, so the job's finish always has a row to update
    await db().transaction((trx) => insertRunRow(trx, { ...o, id, createdAt: nowIso() }));
    const finish = async (j: RunEnd): Promise<void> => {
      await db()('monte_carlo_runs').where({ id }).whereNull('finishedAt').update(endColumns(j));
    };
    try {
      startJob({ id, workspaceId: o.workspaceId, caseId: o.caseId, validCase: o.caseFile, spec: o.spec, onFinish: finish });
    } catch (err) {
      await finish({ status: 'failed', done: 0, result: null, error: 'The run could not start.', finishedAt: nowIso() });
      if (err instanceof TooManyRunsError) throw new HttpError(429, err.message);
      throw err;
    }
    return progress(o.workspaceId, o.caseId, id);
  },

  progress,

  async result(workspaceId, caseId, runId) {
    const run = await progress(workspaceId, caseId, runId);
    return run.finishedAt ? run.result : null;
  },

  /**
   * The workers of a run this server holds stop at their next progress tick. A
   * run stored as running that no worker here holds (its server was restarted)
   * is marked cancelled at once, with the reason, instead of answering 409 for ever.
   */
  async cancel(o) {
    const run = await progress(o.workspaceId, o.caseId, o.runId);
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
    if (!marked) return progress(o.workspaceId, o.caseId, o.runId); // it finished meanwhile: show how
    return { ...run, status: 'cancelled', error: CANCELLED_NOT_RUNNING, finishedAt };
  },

  async list(workspaceId, caseId, limit = 10) {
    const rows = await runsWithAuthor(db()).where({ 'r.workspaceId': workspaceId, 'r.caseId': caseId }).orderBy('r.createdAt', 'desc').limit(limit);
    return rows.map((r: Row) => {
      const { result: _omit, ...rest } = fromRow({ ...r, result: null }); // eslint-disable-line @typescript-eslint/no-unused-vars
      const live = getJob(r.id);
      return live && !r.finishedAt ? { ...rest, status: live.status, done: live.done } : rest;
    });
  },
};
