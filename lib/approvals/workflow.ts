import { CAN, type Role } from '@/lib/auth/roles';

/**
 * The approval workflow of a business case, as pure functions (no database).
 *
 *   draft ──submit──▶ submitted ──approve × N──▶ approved   (final, frozen)
 *                        │   ├──reject────────▶ rejected   (final)
 *                        │   └──return────────▶ returned ──submit──▶ submitted …
 *
 * Decisions:
 * - Only a draft or a returned case can be submitted (analyst or admin). A
 *   returned case goes back to the same approvers as a new round: approvals
 *   given before it was sent back no longer count.
 * - A rejected case is closed: the "no" is kept on record as it was. To try
 *   again, the analyst starts a new revision (a new draft copied from it), as
 *   for an approved case.
 * - Approvers and admins decide; whoever submitted the current round cannot
 *   approve, reject or return it (no marking one's own homework).
 * - `approvalsRequired` distinct people must approve; a second approval by the
 *   same person in the same round is refused and does not count.
 * - Any one reject or return ends the round at once.
 * - Reject and return need a comment saying why; submit and approve may carry one.
 */
export const CASE_STATUSES = ['draft', 'submitted', 'approved', 'rejected', 'returned'] as const;
export type CaseStatus = (typeof CASE_STATUSES)[number];

export const DECISIONS = ['approve', 'reject', 'return'] as const;
export type Decision = (typeof DECISIONS)[number];
export type EventAction = 'submit' | Decision | 'revision';

export type WorkflowEvent = { userId: number | null; action: string; at: string };

export type WorkflowState = {
  status: CaseStatus;
  /** Who submitted the current (latest) round. */
  submittedBy: number | null;
  approvalsRequired: number;
  /** All events of the case, oldest first. */
  events: WorkflowEvent[];
};

export type Refusal = { ok: false; status: 403 | 409 | 422; reason: string };
export type Outcome<T> = ({ ok: true } & T) | Refusal;

const refuse = (status: Refusal['status'], reason: string): Refusal => ({ ok: false, status, reason });

export const DECISION_LABELS: Record<Decision, string> = { approve: 'approved', reject: 'rejected', return: 'sent back for changes' };

/** Events since the case was last submitted: the current round. */
export function currentRound(events: WorkflowEvent[]): WorkflowEvent[] {
  let start = -1;
  events.forEach((e, i) => {
    if (e.action === 'submit') start = i;
  });
  return start < 0 ? [] : events.slice(start);
}

/** Distinct people who approved the current round. */
export function approversInRound(events: WorkflowEvent[]): number[] {
  const ids = new Set<number>();
  for (const e of currentRound(events)) if (e.action === 'approve' && e.userId != null) ids.add(e.userId);
  return [...ids];
}

export function canSubmit(state: WorkflowState, role: Role): Outcome<{ next: CaseStatus }> {
  if (!(CAN.edit as readonly Role[]).includes(role)) return refuse(403, 'Only analysts and admins can submit a case.');
  if (state.status !== 'draft' && state.status !== 'returned') {
    return refuse(409, `This case is ${state.status}; only a draft or a case sent back for changes can be submitted.`);
  }
  return { ok: true, next: 'submitted' };
}

export function canDecide(
  state: WorkflowState,
  role: Role,
  userId: number,
  decision: Decision,
  comment: string,
): Outcome<{ next: CaseStatus; approvals: number; final: boolean }> {
  if (!(CAN.decide as readonly Role[]).includes(role)) return refuse(403, 'Only approvers and admins can decide on a case.');
  if (state.status !== 'submitted') return refuse(409, `This case is ${state.status}, not waiting for a decision.`);
  if (state.submittedBy === userId) return refuse(403, 'You submitted this case, so someone else has to decide on it.');
  if (decision !== 'approve' && comment.trim() === '') {
    return refuse(422, decision === 'reject' ? 'Say why the case is rejected.' : 'Say what has to change before the case comes back.');
  }
  const already = approversInRound(state.events);
  if (decision === 'approve') {
    if (already.includes(userId)) return refuse(409, 'You have already approved this case; another approver has to approve it.');
    const approvals = already.length + 1;
    const final = approvals >= Math.max(1, state.approvalsRequired);
    return { ok: true, next: final ? 'approved' : 'submitted', approvals, final };
  }
  return { ok: true, next: decision === 'reject' ? 'rejected' : 'returned', approvals: already.length, final: true };
}

/** A new revision can be started from a case that is closed (approved or rejected). */
export function canRevise(state: Pick<WorkflowState, 'status'>, role: Role): Outcome<object> {
  if (!(CAN.edit as readonly Role[]).includes(role)) return refuse(403, 'Only analysts and admins can start a new revision.');
  if (state.status !== 'approved' && state.status !== 'rejected') {
    return refuse(409, `This case is ${state.status}; edit it directly instead of starting a new revision.`);
  }
  return { ok: true };
}
