import 'server-only';
import type { Access } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { verifyFrozen } from './canonical';
import { loadCase } from './service';
import { approversInRound, canDecide, canRevise, canSubmit, type CaseStatus, type WorkflowState } from './workflow';

export type CaseEventView = { id: number; action: string; comment: string; at: string; userId: number | null; who: string };

export type CaseApprovalView = {
  case: { id: number; name: string; status: CaseStatus; version: number; revisionOf: number | null; submittedAt: string | null; decidedAt: string | null; submittedBy: string | null };
  events: CaseEventView[];
  approvalsRequired: number;
  approvedBy: number[];
  frozen: { hash: string; verifies: boolean } | null;
  can: { submit: boolean; approve: boolean; reject: boolean; return: boolean; revise: boolean; reason: string | null };
};

/** Status, history and what the caller may do next, for the approval panel. */
export async function fetchCaseApproval(access: Access, id: number): Promise<CaseApprovalView> {
  const k = db();
  const row = await loadCase(k, access.workspace.id, id);
  const events: CaseEventView[] = await k('case_events as e')
    .leftJoin('users as u', 'u.id', 'e.userId')
    .where('e.caseId', id)
    .orderBy('e.id')
    .select('e.id', 'e.action', 'e.comment', 'e.at', 'e.userId', k.raw("coalesce(nullif(u.name, ''), u.email, 'deleted user') as who"));
  const submitter = row.submittedBy ? await k('users').where({ id: row.submittedBy }).first('name', 'email') : null;
  const state: WorkflowState = { status: row.status as CaseStatus, submittedBy: row.submittedBy, approvalsRequired: access.workspace.settings.approvalsRequired, events };
  const submit = canSubmit(state, access.role);
  const approve = canDecide(state, access.role, access.userId, 'approve', 'x');
  const decideOther = canDecide(state, access.role, access.userId, 'reject', 'x');
  const revise = canRevise(state, access.role);
  // Tell a decider why the buttons are missing (own case, already approved); others just see the status.
  const isDecider = (CAN.decide as readonly string[]).includes(access.role);
  const reason = isDecider && row.status === 'submitted' && !approve.ok ? approve.reason : null;
  return {
    case: {
      id: row.id, name: row.name, status: row.status as CaseStatus, version: (row as { version: number }).version, revisionOf: row.revisionOf,
      submittedAt: (row as { submittedAt?: string | null }).submittedAt ?? null, decidedAt: (row as { decidedAt?: string | null }).decidedAt ?? null,
      submittedBy: submitter ? submitter.name || submitter.email : null,
    },
    events,
    approvalsRequired: state.approvalsRequired,
    approvedBy: row.status === 'submitted' || row.status === 'approved' ? approversInRound(events) : [],
    frozen: row.frozenHash ? { hash: row.frozenHash, verifies: verifyFrozen(row) } : null,
    can: {
      submit: submit.ok, approve: approve.ok, reject: decideOther.ok, return: decideOther.ok, revise: revise.ok,
      reason,
    },
  };
}

export type InboxRow = { id: number; name: string; submittedAt: string; submittedBy: string; approvals: number; mine: 'waiting' | 'approved' | 'own' };

/** Submitted cases of a workspace, with where the caller stands on each. */
export async function fetchInbox(access: Access): Promise<InboxRow[]> {
  const k = db();
  const rows = await k('business_cases as c')
    .leftJoin('users as u', 'u.id', 'c.submittedBy')
    .where({ 'c.workspaceId': access.workspace.id, 'c.status': 'submitted' })
    .orderBy('c.submittedAt')
    .select('c.id', 'c.name', 'c.submittedAt', 'c.submittedBy', k.raw("coalesce(nullif(u.name, ''), u.email, '') as who"));
  if (rows.length === 0) return [];
  const events = await k('case_events').whereIn('caseId', rows.map((r) => r.id)).orderBy('id').select('caseId', 'userId', 'action', 'at');
  return rows.map((r) => {
    const approvers = approversInRound(events.filter((e) => e.caseId === r.id));
    const mine = r.submittedBy === access.userId ? 'own' : approvers.includes(access.userId) ? 'approved' : 'waiting';
    return { id: r.id, name: r.name, submittedAt: r.submittedAt, submittedBy: r.who, approvals: approvers.length, mine };
  });
}

/** How many submitted cases wait for this person's decision (the rail badge). */
export async function countWaitingForMe(access: Access): Promise<number> {
  if (!(CAN.decide as readonly string[]).includes(access.role)) return 0;
  return (await fetchInbox(access)).filter((r) => r.mine === 'waiting').length;
}

/** The last decided cases (approved, rejected, sent back), newest first. */
export async function fetchRecentDecisions(workspaceId: number, limit = 20): Promise<Array<{ id: number; name: string; status: CaseStatus; decidedAt: string | null }>> {
  return db()('business_cases').where({ workspaceId }).whereIn('status', ['approved', 'rejected', 'returned']).orderBy('updatedAt', 'desc').limit(limit).select('id', 'name', 'status', 'decidedAt');
}
