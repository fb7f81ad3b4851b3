import 'server-only';
/**
 * The `monte_carlo_runs` rows every job backend shares: what a run was asked
 * and found, read with its author, and the row and audit entry a start writes.
 */
import { writeAudit } from '@/lib/audit';
import type { MonteCarloResult } from '@/lib/engine/monte-carlo';
import type { PolicyKey } from '@/lib/engine/types';
import type { CaseFile } from '@/lib/validation/case';
import type { MonteCarloRequest } from '@/lib/validation/risk';
import type { Knex } from 'knex';
import type { JobStatus } from './jobs';

/** What a run was asked, as stored: the request, and the proposal's policies it summed (runs before the proposal have none). */
export type StoredRunSpec = MonteCarloRequest & { proposal?: Readonly<Record<string, PolicyKey>> | null };

export interface RunView {
  id: string;
  caseId: number;
  status: JobStatus;
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

/** What a start is given: the case as validated now (the run uses it, whatever the case becomes) and the stored spec. */
export interface StartRunInput {
  workspaceId: number;
  caseId: number;
  userId: number;
  caseFile: CaseFile;
  spec: StoredRunSpec;
}

export type Row = Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any -- a knex row

export function fromRow(row: Row): RunView {
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
export function runsWithAuthor(k: Knex) {
  return k('monte_carlo_runs as r').leftJoin('users as u', 'u.id', 'r.createdBy').select('r.*', 'u.name as authorName', 'u.email as authorEmail');
}

/** The stored run of this workspace's case, or null. */
export async function fetchRunRow(k: Knex, workspaceId: number, caseId: number, runId: string): Promise<RunView | null> {
  const row = await runsWithAuthor(k).where({ 'r.id': runId, 'r.workspaceId': workspaceId, 'r.caseId': caseId }).first();
  return row ? fromRow(row) : null;
}

/** The row (status running) and its audit entry, in the caller's transaction. */
export async function insertRunRow(trx: Knex.Transaction, o: StartRunInput & { id: string; createdAt: string }): Promise<void> {
  await trx('monte_carlo_runs').insert({
    id: o.id, workspaceId: o.workspaceId, caseId: o.caseId, spec: JSON.stringify(o.spec), status: 'running',
    iterations: o.spec.iterations, done: 0, createdBy: o.userId, createdAt: o.createdAt,
  });
  await writeAudit(trx, {
    workspaceId: o.workspaceId, userId: o.userId, action: 'run', entity: 'monte_carlo_run', entityId: o.id,
    after: { caseId: o.caseId, ...o.spec },
  });
}

/** A run's end as it is written: the first recorded end wins (a run marked cancelled or interrupted keeps that). */
export type RunEnd = { status: JobStatus; done: number; result: MonteCarloResult | null; error: string | null; finishedAt: string | null };

export function endColumns(j: RunEnd) {
  return { status: j.status, done: j.done, result: j.result ? JSON.stringify(j.result) : null, error: j.error, finishedAt: j.finishedAt };
}
