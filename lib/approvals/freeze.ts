import 'server-only';
import type { Knex } from 'knex';
import { db } from '@/lib/db';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import type { CaseResult } from '@/lib/engine';
import { invalid } from '@/lib/http';
import { validateCase, type CaseFile } from '@/lib/validation/case';
import { decideFigures } from '@/lib/cases/decision';
import { fetchPinnedRun } from '@/lib/risk/runs';
import { nowIso } from '@/lib/time';
import { readEngineLives, readPlanSettings, readTruckFigures } from '@/lib/validation/business-case';
import { canonicalJson, sha256Hex, verifyFrozen, type FrozenColumns, type FrozenRecord } from './canonical';

export type CaseRow = FrozenColumns & {
  id: number;
  workspaceId: number;
  name: string;
  assumptionSetId: number | null;
  selection: string;
  status: string;
  /** canonical case/1 stored at submission, or null (never submitted, or sent back) */
  submittedCase?: string | null;
  /** the plan settings JSON as stored */
  plan?: string | null;
  /** the case's own truck figures JSON as stored (migration 0018), or null */
  truckFigures?: string | null;
  /** the engine-life overrides JSON as stored (migration 0019), or null */
  engineLives?: string | null;
  createdAt?: string;
};

type SelectionItem = { truckId: number; repowerOfferId?: number | null };

/**
 * The case/1 a business case stands for today, from the stored fleet, engines,
 * offers and its assumption set. An empty selection means every truck of the
 * workspace with its own offer. Invalid data is a 422 listing every problem —
 * including a selected truck since removed from the register, which would
 * otherwise silently drop out — so nothing can be submitted or approved that
 * the engine would not accept.
 */
export async function buildCaseForRow(row: CaseRow, k: Knex = db()): Promise<CaseFile> {
  if (row.assumptionSetId == null) throw invalid([{ path: 'assumptionSetId', message: 'The case has no assumption set.' }]);
  let selection: SelectionItem[] = [];
  try {
    selection = JSON.parse(row.selection || '[]');
  } catch {
    throw invalid([{ path: 'selection', message: 'The stored truck selection is not valid JSON.' }]);
  }
  if (selection.length) {
    // same rule and wording as loadValidCase, so the case page and the submit agree
    const present = new Set((await k('trucks').where({ workspaceId: row.workspaceId }).whereIn('id', selection.map((s) => s.truckId)).pluck('id')).map(Number));
    const missing = selection.flatMap((s, i) => (present.has(s.truckId) ? [] : [{ path: `selection[${i}]`, message: 'this truck has been removed from the fleet register' }]));
    if (missing.length) throw invalid(missing, 'The case names trucks that are no longer in the fleet register.');
  }
  const file = await buildCaseFile(
    row.workspaceId,
    {
      name: row.name,
      assumptionSetId: row.assumptionSetId,
      truckIds: selection.length ? selection.map((s) => s.truckId) : undefined,
      offerOverrides: Object.fromEntries(selection.map((s) => [s.truckId, s.repowerOfferId ?? null])),
      truckFigures: readTruckFigures(row.truckFigures),
      engineLives: readEngineLives(row.engineLives),
    },
    k,
  );
  const checked = validateCase(file);
  if (!checked.ok) throw invalid(checked.problems.map((p) => ({ path: `case.${p.path}`, message: p.message })), 'The case data is not valid; fix it before submitting.');
  return checked.value;
}

/** The validated case/1 to store with a submission, as canonical JSON text. */
export async function snapshotForSubmission(trx: Knex.Transaction, row: CaseRow): Promise<string> {
  return canonicalJson(await buildCaseForRow(row, trx));
}

/** The snapshot stored at submission, or null. */
export function readSubmittedCase(row: Pick<CaseRow, 'submittedCase'>): CaseFile | null {
  return row.submittedCase ? (JSON.parse(row.submittedCase) as CaseFile) : null;
}

/** What the freeze needs of the workspace and the case besides its row. */
export interface FreezeContext {
  currency: string;
  fiscalYearStartMonth: number;
}

/**
 * Freezes a case for the approving transaction (computed just before it from the
 * submitted row; `decideCase` stores it only if the row is unchanged): the case/1 exactly as it was
 * submitted, its case-result/1, the proposal its saved plan makes (budgets,
 * shop capacity, chosen trucks, capital plan, swap schedule) with its decision
 * summary, and the pinned Monte Carlo run, as one canonical JSON record
 * (`frozenRecord`, `frozen-record/1`), and the SHA-256 of that text. The case
 * and result are also kept as their own canonical texts (`frozenCase`,
 * `frozenResult`), which `verifyFrozen` checks against the record. Fleet edits
 * between submission and approval never reach it. A case submitted before
 * snapshots were kept has none; it is built from the stored data as before.
 */
export async function freezeCase(
  trx: Knex,
  row: CaseRow,
  ctx: FreezeContext,
): Promise<{ frozenCase: string; frozenResult: string; frozenRecord: string; frozenHash: string }> {
  const file = readSubmittedCase(row) ?? (await buildCaseForRow(row, trx));
  const plan = readPlanSettings(row.plan ?? null, row.createdAt ?? nowIso());
  const pinnedRun = await fetchPinnedRun(row.id, trx);
  const { result, proposal, summary } = await decideFigures(file, {
    caseId: row.id,
    caseName: row.name,
    status: 'approved',
    source: 'frozen',
    currency: ctx.currency,
    fiscalYearStartMonth: ctx.fiscalYearStartMonth,
    plan,
    pinnedRun,
  });
  const record: FrozenRecord = {
    format: 'frozen-record/1',
    caseId: row.id,
    case: file,
    result,
    proposal: {
      settings: { budgets: plan.budgets, swapsPerMonth: plan.swapsPerMonth, startMonth: plan.startMonth, capacityByMonth: plan.capacityByMonth ?? {}, maxDelayMonths: plan.maxDelayMonths },
      chosenTrucks: proposal.chosen,
      policies: proposal.policies,
      plan: proposal.plan,
      schedule: proposal.schedule,
      timings: proposal.timings,
    },
    summary,
    pinnedRun,
  };
  const frozenRecord = canonicalJson(record);
  // the record once parsed back, so the separate texts are byte for byte what the record holds
  const parsed = JSON.parse(frozenRecord) as FrozenRecord;
  return { frozenCase: canonicalJson(parsed.case), frozenResult: canonicalJson(parsed.result), frozenRecord, frozenHash: sha256Hex(frozenRecord) };
}

/**
 * The result to show for a case: an approved (frozen) case is always served from
 * its stored frozenResult, never recomputed. Null when the case is not frozen —
 * the caller then evaluates the live data.
 */
export function readFrozenResult(row: FrozenColumns): CaseResult | null {
  return row.frozenResult ? (JSON.parse(row.frozenResult) as CaseResult) : null;
}

/** The frozen case/1 of an approved case, or null. */
export function readFrozenCase(row: FrozenColumns): CaseFile | null {
  return row.frozenCase ? (JSON.parse(row.frozenCase) as CaseFile) : null;
}

export type ApprovalStamp = {
  approvedBy: Array<{ userId: number | null; name: string; email: string; at: string; comment: string }>;
  approvedAt: string;
  hash: string;
  verifies: boolean;
};

/**
 * Who approved a case, when, and the hash of what they approved (for the
 * workbook's stamp). Null unless the case is approved and frozen.
 */
export async function fetchApprovalStamp(caseId: number, k: Knex = db()): Promise<ApprovalStamp | null> {
  const row = await k('business_cases').where({ id: caseId }).first();
  if (!row || row.status !== 'approved' || !row.frozenHash) return null;
  const lastSubmit = await k('case_events').where({ caseId, action: 'submit' }).orderBy('id', 'desc').first('id');
  const approvals = await k('case_events as e')
    .leftJoin('users as u', 'u.id', 'e.userId')
    .where({ 'e.caseId': caseId, 'e.action': 'approve' })
    .andWhere('e.id', '>', lastSubmit?.id ?? 0)
    .orderBy('e.id')
    .select('e.userId', 'u.name', 'u.email', 'e.at', 'e.comment');
  return {
    approvedBy: approvals.map((a) => ({ userId: a.userId, name: a.name ?? '', email: a.email ?? '', at: a.at, comment: a.comment })),
    approvedAt: row.decidedAt,
    hash: row.frozenHash,
    verifies: verifyFrozen(row),
  };
}
