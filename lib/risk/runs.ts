import 'server-only';
/**
 * Monte Carlo runs: start one for a business case, read one, cancel one (through
 * this server's job backend, lib/risk/backend.ts: in-process with SQLite, the
 * pg-boss queue with PostgreSQL); the pinned run of a case.
 */
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { HttpError, invalid, notFound } from '@/lib/http';
import { nowIso } from '@/lib/time';
import type { MonteCarloRequest } from '@/lib/validation/risk';
import type { Knex } from 'knex';
import { MEASURE_LABELS, measureLabel, measureSummary, runMeasure, type RunMeasure } from './measures';
import { getJob } from './jobs';
import { runBackend } from './backend';
import { fromRow, type RunView, type StartRunInput, type StoredRunSpec } from './run-rows';

export type { RunView, StoredRunSpec, StartRunInput } from './run-rows';
export { CANCELLED_NOT_RUNNING } from './backends/in-process';

/** Why a run left `running` by an earlier server process is failed when a server starts. */
export const INTERRUPTED_BY_RESTART = 'Interrupted by a server restart; start the run again.';

/** Start a run: the row and its audit entry, then this server's backend runs or enqueues it (answers at once). */
export function startRun(o: StartRunInput): Promise<RunView> {
  return runBackend().start(o);
}

/** A run of this workspace's case, with its progress, and its result once finished; 404 otherwise. */
export function readRun(workspaceId: number, caseId: number, runId: string): Promise<RunView> {
  return runBackend().progress(workspaceId, caseId, runId);
}

/** The case's latest runs, newest first, without their results. */
export function listRuns(workspaceId: number, caseId: number, limit = 10): Promise<Omit<RunView, 'result'>[]> {
  return runBackend().list(workspaceId, caseId, limit);
}

/** Cancel a running run (409 once it has finished), on whichever server runs it. */
export function cancelRun(o: { workspaceId: number; caseId: number; runId: string; userId: number }): Promise<RunView> {
  return runBackend().cancel(o);
}

/**
 * With the in-process backend a run lives in the worker threads of the server
 * process that started it, so a row still `running` when a server starts was
 * interrupted by a restart: it is marked failed (instrumentation.ts →
 * lib/risk/startup.ts) rather than shown running, and uncancellable, for ever.
 * Runs this process holds are left alone. (With the queue backend the queue's
 * expiry does this, since other servers' runs are in the same table.)
 * Returns how many rows were marked.
 */
export async function failInterruptedRuns(k: Knex = db(), at = nowIso()): Promise<number> {
  const rows: Array<{ id: string }> = await k('monte_carlo_runs').where({ status: 'running' }).whereNull('finishedAt').select('id');
  const ids = rows.map((r) => r.id).filter((id) => getJob(id) === null);
  if (ids.length === 0) return 0;
  return k('monte_carlo_runs').whereIn('id', ids).where({ status: 'running' }).whereNull('finishedAt').update({ status: 'failed', error: INTERRUPTED_BY_RESTART, finishedAt: at });
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
