import { describe, expect, it } from 'vitest';
import { approversInRound, canDecide, canRevise, canSubmit, type WorkflowState } from '@/lib/approvals/workflow';
import { canonicalJson, frozenHashOf, verifyFrozen } from '@/lib/approvals/canonical';

const ev = (userId: number, action: string) => ({ userId, action, at: '2027-01-01T00:00:00.000Z' });
const state = (over: Partial<WorkflowState> = {}): WorkflowState => ({ status: 'submitted', submittedBy: 1, approvalsRequired: 1, events: [ev(1, 'submit')], ...over });

describe('approval workflow rules', () => {
  it('lets analysts and admins submit a draft or a returned case, nobody else, nothing else', () => {
    expect(canSubmit(state({ status: 'draft' }), 'analyst')).toEqual({ ok: true, next: 'submitted' });
    expect(canSubmit(state({ status: 'returned' }), 'admin').ok).toBe(true);
    expect(canSubmit(state({ status: 'draft' }), 'viewer')).toMatchObject({ ok: false, status: 403 });
    expect(canSubmit(state({ status: 'draft' }), 'approver')).toMatchObject({ ok: false, status: 403 });
    for (const s of ['submitted', 'approved', 'rejected'] as const) expect(canSubmit(state({ status: s }), 'analyst')).toMatchObject({ ok: false, status: 409 });
  });

  it('refuses the submitter deciding on their own case, whatever their role', () => {
    expect(canDecide(state(), 'admin', 1, 'approve', '')).toMatchObject({ ok: false, status: 403 });
    expect(canDecide(state(), 'admin', 1, 'reject', 'no')).toMatchObject({ ok: false, status: 403 });
    expect(canDecide(state(), 'analyst', 2, 'approve', '')).toMatchObject({ ok: false, status: 403 });
    expect(canDecide(state(), 'viewer', 2, 'approve', '')).toMatchObject({ ok: false, status: 403 });
  });

  it('counts distinct approvers in the current round only', () => {
    const events = [ev(1, 'submit'), ev(2, 'approve'), ev(2, 'approve'), ev(3, 'return'), ev(1, 'submit'), ev(4, 'approve'), ev(4, 'approve')];
    expect(approversInRound(events)).toEqual([4]);
    const s = state({ approvalsRequired: 2, events: [ev(1, 'submit'), ev(2, 'approve')] });
    expect(canDecide(s, 'approver', 2, 'approve', '')).toMatchObject({ ok: false, status: 409 });
    expect(canDecide(s, 'admin', 3, 'approve', '')).toEqual({ ok: true, next: 'approved', approvals: 2, final: true });
    expect(canDecide(state({ approvalsRequired: 2 }), 'approver', 2, 'approve', '')).toEqual({ ok: true, next: 'submitted', approvals: 1, final: false });
  });

  it('needs a comment to reject or send back, and ends the round at once', () => {
    expect(canDecide(state(), 'approver', 2, 'reject', ' ')).toMatchObject({ ok: false, status: 422 });
    expect(canDecide(state(), 'approver', 2, 'return', '')).toMatchObject({ ok: false, status: 422 });
    expect(canDecide(state({ approvalsRequired: 3 }), 'approver', 2, 'reject', 'Payback too long')).toMatchObject({ ok: true, next: 'rejected', final: true });
    expect(canDecide(state(), 'approver', 2, 'return', 'Add the high-fuel set')).toMatchObject({ ok: true, next: 'returned' });
  });

  it('starts a new revision only from a closed case, by analysts and admins', () => {
    expect(canRevise({ status: 'approved' }, 'analyst').ok).toBe(true);
    expect(canRevise({ status: 'rejected' }, 'admin').ok).toBe(true);
    expect(canRevise({ status: 'draft' }, 'analyst')).toMatchObject({ ok: false, status: 409 });
    expect(canRevise({ status: 'approved' }, 'approver')).toMatchObject({ ok: false, status: 403 });
  });
});

describe('canonical JSON and the frozen hash', () => {
  it('gives the same text whatever the key order, and drops undefined members', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { f: 1, e: 0 }], c: undefined } })).toBe('{"a":{"d":[2,{"e":0,"f":1}]},"b":1}');
    expect(canonicalJson({ x: 1, y: 2 })).toBe(canonicalJson({ y: 2, x: 1 }));
  });

  it('hashes SHA-256 over case, newline, result (known value) and verifies only an intact record', () => {
    // printf '{"a":1}\n{"b":2}' | sha256sum, computed outside Haulcase with coreutils
    const hash = frozenHashOf('{"a":1}', '{"b":2}');
    expect(hash).toBe('45d6067c8b6db1243a719b35b6b9014a34278fd1dc14b510a35d6f7f1e406972');
    const row = { frozenCase: '{"a":1}', frozenResult: '{"b":2}', frozenHash: hash };
    expect(verifyFrozen(row)).toBe(true);
    expect(verifyFrozen({ ...row, frozenResult: '{"b":3}' })).toBe(false);
    expect(verifyFrozen({ ...row, frozenHash: null })).toBe(false);
  });
});
