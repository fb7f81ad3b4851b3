import 'server-only';
/**
 * Monte Carlo runs: start one for a business case (row + audit in one
 * transaction, then the workers), read one (live progress from this server's
 * job manager, else the stored row), cancel one.
 */
import { randomUUID } from 'node:crypto';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { HttpError, invalid, notFound } from '@/lib/http';
import { nowIso } from '@/lib/time';
import type { MonteCarloResult } from '@/lib/engine/monte-carlo';
import type { PolicyKey } from '@/lib/engine/types';
import type { CaseFile } from '@/lib/validation/case';
import type { MonteCarloRequest } from '@/lib/validation/risk';
import type { Knex } from 'knex';
import { MEASURE_LABELS, measureLabel, measureSummary, runMeasure, type RunMeasure } from './measures';
import { cancelJob, getJob, MAX_RUNNING, runningCount, startJob, TooManyRunsError, type JobView } from './jobs';

/** Why a run left `running` by an earlier server process is failed when a server starts. */
export const INTERRUPTED_BY_RESTART = 'Interrupted by a server restart; start the run again.';
/** What a cancel of a run that no server holds any more records. */
export const CANCELLED_NOT_RUNNING = 'Cancelled: the run was no longer in progress on this server (interrupted by a restart).';

/** What a run was asked, as stored: the request, and the proposal's policies it summed (runs before the proposal have none). */
export type StoredRunSpec = MonteCarloRequest & { proposal?: Readonly<Record<string, PolicyKey>> | null };

export interface RunView {
  id: string;
  caseId: number;
  status: JobView['status'];
  iterations: number;
  done: number;
  spec: StoredRunSpec;
  createdAt: string;
  finishedAt: string | null;
  error: string | null;
  result: MonteCarloResult | null;
  /** who started it (null: the account has since been removed) */
  author: { name: string; email: string } | null;
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
    author: row.authorEmail == null ? null : { name: row.authorName ?? '', email: row.authorEmail },
  };
}

/** Runs with their author's name and e-mail (`authorName`, `authorEmail`). */
function runsWithAuthor(k: Knex) {
  return k('monte_carlo_runs as r').leftJoin('users as u', 'u.id', 'r.createdBy').select('r.*', 'u.name as authorName', 'u.email as authorEmail');
}

export async function startRun(o: { workspaceId: number; caseId: number; userId: number; caseFile: CaseFile; spec: StoredRunSpec }): Promise<RunView> {
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
  const row = await runsWithAuthor(db()).where({ 'r.id': runId, 'r.workspaceId': workspaceId, 'r.caseId': caseId }).first();
  if (!row) throw notFound('No such Monte Carlo run.');
  const stored = fromRow(row);
  const live = getJob(runId);
  if (!live || stored.finishedAt) return stored;
  return { ...stored, status: live.status, done: live.done, result: live.result, error: live.error, finishedAt: live.finishedAt };
}

/** The case's latest runs, newest first, without their results. */
export async function listRuns(workspaceId: number, caseId: number, limit = 10): Promise<Omit<RunView, 'result'>[]> {
  const rows = await runsWithAuthor(db()).where({ 'r.workspaceId': workspaceId, 'r.caseId': caseId }).orderBy('r.createdAt', 'desc').limit(limit);
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
  /** what the run was asked, as stored (distributions, sampleFailures, iterations, seed, measure, the proposal's policies) */
  spec: StoredRunSpec;
  iterations: number;
  seed: number;
  sampleFailures: boolean;
  distributions: MonteCarloRequest['distributions'];
  measure: { kind: RunMeasure; label: string; truckId: string | null };
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
  const truckId = run.spec.truckId ?? null;
  const s = run.result ? measureSummary(run.result, measure, truckId) : null;
  if (!s) return null;
  return {
    id: run.id,
    caseId: run.caseId,
    spec: { ...run.spec, measure },
    iterations: run.result?.iterations ?? run.iterations,
    seed: run.spec.seed,
    sampleFailures: run.spec.sampleFailures,
    distributions: run.spec.distributions,
    measure: { kind: measure, label: measureLabel(measure, truckId), truckId },
    author: row.authorId == null ? null : { id: row.authorId, name: row.authorName ?? '', email: row.authorEmail ?? '' },
    startedAt: run.createdAt,
    finishedAt: run.finishedAt ?? run.createdAt,
    summary: { mean: s.mean, p10: s.p10, p50: s.p50, p90: s.p90, probLoss: s.probNegative },
  };
}

/** Case states whose pinned run may change: a submission freezes the pinned run with the case. */
const PIN_OPEN = new Set(['draft', 'returned']);

/** The case row of a pin change, checked: here (404), open (409 naming the state), at the version the caller loaded (409). */
async function lockCaseForPin(trx: Knex.Transaction, workspaceId: number, caseId: number, version: number) {
  const row = await trx('business_cases').where({ id: caseId, workspaceId }).first('id', 'status', 'version', 'pinnedRunId');
  if (!row) throw notFound('No such business case in this workspace.');
  if (!PIN_OPEN.has(row.status)) {
    throw new HttpError(409, `This case is ${row.status}; its pinned Monte Carlo run was frozen with the submission. Only a draft or a case sent back for changes can change it.`);
  }
  if (Number(row.version) !== version) throw new HttpError(409, 'Someone else changed this case since you loaded it. Reload and try again.');
  return row as { id: number; status: string; version: number; pinnedRunId: string | null };
}

/**
 * Pin a finished run of the case, read on the proposal, as the run the case
 * quotes (decision summary, submission, frozen record). One transaction: the
 * case row (version + 1) and the audit row.
 */
export async function pinRun(o: { workspaceId: number; caseId: number; userId: number; runId: string; version: number }): Promise<{ version: number; pinnedRunId: string }> {
  return db().transaction(async (trx) => {
    const c = await lockCaseForPin(trx, o.workspaceId, o.caseId, o.version);
    const row = await trx('monte_carlo_runs').where({ id: o.runId, workspaceId: o.workspaceId, caseId: o.caseId }).first();
    if (!row) throw notFound('No such Monte Carlo run of this case.');
    const run = fromRow(row);
    if (run.status !== 'done') throw invalid([{ path: 'runId', message: `only a finished run can be pinned; this one is ${run.status}` }]);
    const measure = runMeasure(run.spec);
    if (measure !== 'proposal' || !run.result?.fleet.proposalNpv) {
      throw invalid([{ path: 'runId', message: `pin a run read on the ${MEASURE_LABELS.proposal}; this one was read on: ${measureLabel(measure, run.spec.truckId)}` }]);
    }
    const version = c.version + 1;
    const n = await trx('business_cases').where({ id: o.caseId, version: c.version }).update({ pinnedRunId: o.runId, version, updatedBy: o.userId, updatedAt: nowIso() });
    if (n !== 1) throw new HttpError(409, 'Someone else changed this case since you loaded it. Reload and try again.');
    await writeAudit(trx, {
      workspaceId: o.workspaceId, userId: o.userId, action: 'pin-run', entity: 'business_case', entityId: o.caseId,
      before: { pinnedRunId: c.pinnedRunId }, after: { pinnedRunId: o.runId, iterations: run.iterations, seed: run.spec.seed },
    });
    return { version, pinnedRunId: o.runId };
  });
}

/** Unpin the case's run (a draft or returned case); nothing pinned answers 409. */
export async function unpinRun(o: { workspaceId: number; caseId: number; userId: number; version: number }): Promise<{ version: number }> {
  return db().transaction(async (trx) => {
    const c = await lockCaseForPin(trx, o.workspaceId, o.caseId, o.version);
    if (!c.pinnedRunId) throw new HttpError(409, 'No Monte Carlo run is pinned to this case.');
    const version = c.version + 1;
    const n = await trx('business_cases').where({ id: o.caseId, version: c.version }).update({ pinnedRunId: null, version, updatedBy: o.userId, updatedAt: nowIso() });
    if (n !== 1) throw new HttpError(409, 'Someone else changed this case since you loaded it. Reload and try again.');
    await writeAudit(trx, { workspaceId: o.workspaceId, userId: o.userId, action: 'unpin-run', entity: 'business_case', entityId: o.caseId, before: { pinnedRunId: c.pinnedRunId }, after: { pinnedRunId: null } });
    return { version };
  });
}
