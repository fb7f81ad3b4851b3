import 'server-only';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { conflict, HttpError, notFound } from '@/lib/http';
import { mailCommitted } from '@/lib/mail/queue';
import { nowIso } from '@/lib/time';
import { freezeCase, snapshotForSubmission, type CaseRow } from './freeze';
import { notifyDecision, notifySubmitted } from './notify';
import { canDecide, canRevise, canSubmit, type CaseStatus, type Decision, type Outcome, type WorkflowState } from './workflow';

type FullCaseRow = CaseRow & { version: number; submittedBy: number | null; plan: string; engineLives?: string | null; revisionOf: number | null };

/** A case of this workspace, or 404 (also for another workspace's id). */
export async function loadCase(k: Knex, workspaceId: number, id: number): Promise<FullCaseRow> {
  if (!Number.isInteger(id) || id <= 0) throw notFound('No such business case.');
  const row = await k('business_cases').where({ id, workspaceId }).first();
  if (!row) throw notFound('No such business case.');
  return row;
}

async function workflowState(k: Knex, row: FullCaseRow, approvalsRequired: number): Promise<WorkflowState> {
  const events = await k('case_events').where({ caseId: row.id }).orderBy('id').select('userId', 'action', 'at');
  return { status: row.status as CaseStatus, submittedBy: row.submittedBy, approvalsRequired, events };
}

function orThrow<T>(o: Outcome<T>): T {
  if (!o.ok) throw new HttpError(o.status, o.reason, o.status === 422 ? [{ path: 'comment', message: o.reason }] : undefined);
  return o;
}

function checkVersion(row: { version: number }, version: number | undefined) {
  if (version !== undefined && version !== row.version) throw conflict();
}

const snapshot = (r: Partial<FullCaseRow>) => ({ status: r.status, version: r.version, frozenHash: r.frozenHash ?? null });

export async function submitCase(access: Access, id: number, input: { comment: string; version?: number }) {
  const k = db();
  const result = await k.transaction(async (trx) => {
    const row = await loadCase(trx, access.workspace.id, id);
    checkVersion(row, input.version);
    const step = orThrow(canSubmit(await workflowState(trx, row, access.workspace.settings.approvalsRequired), access.role));
    // the approvers decide on, and the final approval freezes, exactly this snapshot
    const submittedCase = await snapshotForSubmission(trx, row);
    const at = nowIso();
    const patch = { status: step.next, submittedCase, submittedBy: access.userId, submittedAt: at, decidedAt: null, version: row.version + 1, updatedBy: access.userId, updatedAt: at };
    const n = await trx('business_cases').where({ id, version: row.version }).update(patch);
    if (n !== 1) throw conflict();
    await trx('case_events').insert({ workspaceId: access.workspace.id, caseId: id, userId: access.userId, action: 'submit', comment: input.comment, at });
    await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'submit', entity: 'business_case', entityId: id, before: snapshot(row), after: { ...snapshot({ ...row, ...patch }), comment: input.comment } });
    // the mail is written with the change: both are saved, or neither
    const mail = await notifySubmitted(trx, access, { ...row, ...patch }, input.comment);
    return { row: { ...row, ...patch }, mail };
  });
  await mailCommitted();
  const mail = result.mail;
  return { status: result.row.status, version: result.row.version, mail };
}

export async function decideCase(access: Access, id: number, input: { decision: Decision; comment: string; version?: number }) {
  const k = db();
  const freezeContext = { currency: access.workspace.currency, fiscalYearStartMonth: access.workspace.settings.fiscalYearStartMonth };
  // The frozen record's figures (the evaluation and the decision summary's tornado: a second or more on a large
  // case) are computed before the transaction, so the database is not held while the engine runs. A submitted
  // case cannot change (edits, plan and pinned run are refused while submitted); should its row have moved on
  // by the time the transaction reads it, the record is computed again inside it.
  // Computed only for the approval that closes the round (the transaction applies the same workflow rule again).
  const before = input.decision === 'approve' ? await loadCase(k, access.workspace.id, id) : null;
  const closing = before ? canDecide(await workflowState(k, before, access.workspace.settings.approvalsRequired), access.role, access.userId, input.decision, input.comment) : null;
  const prepared = before && closing?.ok && closing.next === 'approved' ? { version: before.version, frozen: await freezeCase(k, before, freezeContext) } : null;
  const result = await k.transaction(async (trx) => {
    const row = await loadCase(trx, access.workspace.id, id);
    checkVersion(row, input.version);
    const state = await workflowState(trx, row, access.workspace.settings.approvalsRequired);
    const step = orThrow(canDecide(state, access.role, access.userId, input.decision, input.comment));
    const at = nowIso();
    const frozen = step.next === 'approved' ? (prepared?.version === row.version ? prepared.frozen : await freezeCase(trx, row, freezeContext)) : {};
    const patch = {
      status: step.next,
      ...(step.final ? { decidedAt: at } : {}),
      ...frozen,
      // a case sent back is edited again; its next submission takes a new snapshot
      ...(step.next === 'returned' ? { submittedCase: null } : {}),
      version: row.version + 1,
      updatedBy: access.userId,
      updatedAt: at,
    };
    const n = await trx('business_cases').where({ id, version: row.version }).update(patch);
    if (n !== 1) throw conflict();
    await trx('case_events').insert({ workspaceId: access.workspace.id, caseId: id, userId: access.userId, action: input.decision, comment: input.comment, at });
    await writeAudit(trx, {
      workspaceId: access.workspace.id, userId: access.userId, action: input.decision, entity: 'business_case', entityId: id,
      before: snapshot(row), after: { ...snapshot({ ...row, ...patch }), comment: input.comment, approvals: step.approvals },
    });
    const mail = await notifyDecision(trx, access, { ...row, ...patch }, input.decision, step.final, input.comment);
    return { row: { ...row, ...patch }, final: step.final, approvals: step.approvals, mail };
  });
  await mailCommitted();
  const mail = result.mail;
  return { status: result.row.status, version: result.row.version, approvals: result.approvals, frozenHash: result.row.frozenHash ?? null, mail };
}

/**
 * "New revision": a new draft with the same name, assumption set, selection and
 * plan, pointing back at the closed case. The original stays exactly as it was.
 */
export async function createRevision(access: Access, id: number): Promise<{ id: number }> {
  return db().transaction(async (trx) => {
    const row = await loadCase(trx, access.workspace.id, id);
    orThrow(canRevise({ status: row.status as CaseStatus }, access.role));
    const count = await trx('business_cases').where({ workspaceId: access.workspace.id, revisionOf: id }).count<{ n: number }[]>({ n: '*' });
    const at = nowIso();
    const values = {
      workspaceId: access.workspace.id,
      name: `${row.name.replace(/ \(rev\. \d+\)$/, '')} (rev. ${Number(count[0].n) + 2})`.slice(0, 200),
      assumptionSetId: row.assumptionSetId,
      selection: row.selection,
      plan: row.plan,
      truckFigures: row.truckFigures ?? null,
      engineLives: row.engineLives ?? null,
      status: 'draft',
      revisionOf: id,
      version: 1,
      createdBy: access.userId,
      updatedBy: access.userId,
      createdAt: at,
      updatedAt: at,
    };
    const [ins] = await trx('business_cases').insert(values).returning('id');
    const newId = typeof ins === 'object' ? ins.id : ins;
    await trx('case_events').insert({ workspaceId: access.workspace.id, caseId: newId, userId: access.userId, action: 'revision', comment: `New revision of case ${id}`, at });
    await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'create-revision', entity: 'business_case', entityId: newId, before: null, after: { ...values, revisionOf: id } });
    return { id: newId };
  });
}
