import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { verifyFrozen } from '@/lib/approvals/canonical';
import { fetchApprovalStamp, readFrozenResult } from '@/lib/approvals/freeze';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { POST as decide } from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
import { GET as history } from '@/app/api/workspaces/[workspace]/cases/[id]/history/route';
import { POST as revise } from '@/app/api/workspaces/[workspace]/cases/[id]/revision/route';
import { PUT as putApprovals } from '@/app/api/workspaces/[workspace]/settings/approvals/route';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { insertDraftCase } from './support/cases';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('approval workflow with e-mail through a real SMTP sink on $name', ({ pg }) => {
  let k: Knex;
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  const p = (id: number) => ({ workspace: WS, id: String(id) });
  const mails = async () => k('mail_sink').orderBy('id');

  beforeAll(async () => {
    ({ k, close, ids } = await openMailDb(pg));
  });
  afterAll(async () => {
    await close();
  });

  it('refuses a viewer both submitting and deciding (403), and changes nothing', async () => {
    const id = await insertDraftCase(k, WS, 'Viewer tries');
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(submit, p(id), { body: {} })).status).toBe(403);
    expect((await call(decide, p(id), { body: { decision: 'approve' } })).status).toBe(403);
    expect((await call(revise, p(id), { method: 'POST' })).status).toBe(403);
    expect((await call(history, p(id))).status).toBe(200);
    expect((await k('business_cases').where({ id }).first()).status).toBe('draft');
    signInAs(null);
    expect((await call(submit, p(id), { body: {} })).status).toBe(401);
  });

  it('answers 404 for an unknown id and for another workspace\'s case, 422 for a bad body', async () => {
    const other = await insertDraftCase(k, 'corrin-flats', 'Corrin case');
    signInAs(ids['analyst@aldervane.test']); // a member of both sites, asking through the wrong one
    expect((await call(submit, p(other), { body: {} })).status).toBe(404);
    expect((await call(submit, p(999999), { body: {} })).status).toBe(404);
    const id = await insertDraftCase(k, WS, 'Bad body');
    const bad = await call(submit, p(id), { body: { comment: 5 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems[0].path).toBe('comment');
    signInAs(ids['approver@aldervane.test']);
    const noDecision = await call(decide, p(id), { body: { decision: 'maybe' } });
    expect(noDecision.status).toBe(422);
    expect(noDecision.body.problems[0].path).toBe('decision');
  });

  it('submits, mails the approvers with a link, and refuses self-approval', async () => {
    await k('mail_sink').del();
    const id = await insertDraftCase(k, WS, 'North Pit repower 2027');
    signInAs(ids['admin@aldervane.test']);
    const r = await call(submit, p(id), { body: { comment: 'Ready for the capex committee.' } });
    expect(r.status).toBe(200);
    expect(r.body.status).toBe('submitted');
    const [m] = await mails();
    expect(JSON.parse(m.toAddresses)).toEqual(['approver@aldervane.test']);
    expect(m.subject).toBe('Approval requested: North Pit repower 2027');
    expect(m.workspaceSlug).toBe(WS);
    expect(m.text).toContain(`/${WS}/approvals/${id}`);
    expect(m.text).toContain('Ready for the capex committee.');
    // no APP_URL in tests: links take the origin of the request that sent the mail
    expect(m.html).toContain(`href="http://127.0.0.1/${WS}/approvals/${id}"`);
    // The admin may decide on others' cases but not on the one they submitted.
    const self = await call(decide, p(id), { body: { decision: 'approve', comment: 'fine by me' } });
    expect(self.status).toBe(403);
    expect(self.body.error).toMatch(/you submitted this case/i);
    expect((await k('business_cases').where({ id }).first()).status).toBe('submitted');
    // Submitting again while it waits is a conflict.
    expect((await call(submit, p(id), { body: {} })).status).toBe(409);
  });

  it('needs N distinct approvers: a second approval by the same person does not count; final approval freezes and mails the submitter', async () => {
    await k('workspaces').where({ slug: WS }).update({ settings: JSON.stringify({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 2 }) });
    const id = await insertDraftCase(k, WS, 'Two-signature case');
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: {} })).status).toBe(200);
    await k('mail_sink').del();

    signInAs(ids['approver@aldervane.test']);
    const first = await call(decide, p(id), { body: { decision: 'approve', comment: 'Numbers check out.' } });
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({ status: 'submitted', approvals: 1, frozenHash: null });
    const again = await call(decide, p(id), { body: { decision: 'approve', comment: 'Really.' } });
    expect(again.status).toBe(409);
    const h = await call(history, p(id));
    expect(h.body.approvedBy).toEqual([ids['approver@aldervane.test']]);
    expect(h.body.can.approve).toBe(false);
    expect(h.body.can.reason).toMatch(/already approved/);
    expect(h.body.case.status).toBe('submitted');

    signInAs(ids['admin@aldervane.test']);
    const second = await call(decide, p(id), { body: { decision: 'approve', comment: 'Second signature.' } });
    expect(second.status).toBe(200);
    expect(second.body.status).toBe('approved');
    expect(second.body.frozenHash).toMatch(/^[0-9a-f]{64}$/);

    const sent = await mails();
    expect(sent.map((m) => m.subject)).toEqual(['Approval: Two-signature case', 'Approved: Two-signature case']);
    for (const m of sent) {
      expect(JSON.parse(m.toAddresses)).toEqual(['analyst@aldervane.test']);
      expect(m.text).toContain(`/${WS}/approvals/${id}`);
    }
    expect(sent[1].text).toContain('Second signature.');
    const audit = await k('audit_log').where({ entity: 'business_case', entityId: String(id) }).orderBy('id').pluck('action');
    expect(audit).toEqual(['submit', 'approve', 'approve']);
    await k('workspaces').where({ slug: WS }).update({ settings: JSON.stringify({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 1 }) });
  });

  it('keeps a frozen case byte for byte after the fleet, engines and assumptions change, and its hash verifies', async () => {
    const id = await insertDraftCase(k, WS, 'Frozen case');
    signInAs(ids['analyst@aldervane.test']);
    await call(submit, p(id), { body: {} });
    signInAs(ids['approver@aldervane.test']);
    expect((await call(decide, p(id), { body: { decision: 'approve', comment: 'Approved at the March committee.' } })).status).toBe(200);
    const before = await k('business_cases').where({ id }).first('frozenCase', 'frozenResult', 'frozenRecord', 'frozenHash');
    expect(JSON.parse(before.frozenCase).trucks).toHaveLength(24);
    expect(readFrozenResult(before)?.format).toBe('case-result/1');

    const ws = await k('workspaces').where({ slug: WS }).first('id');
    await k('trucks').where({ workspaceId: ws.id }).update({ engineHours: 1, annualHours: 4000 });
    await k('engine_types').where({ workspaceId: ws.id }).update({ overhaulCost: 1 });
    await k('assumption_sets').where({ workspaceId: ws.id }).update({ notes: 'edited' });
    await k('repower_offers').where({ workspaceId: ws.id }).update({ modulePrice: 10 });

    const after = await k('business_cases').where({ id }).first('frozenCase', 'frozenResult', 'frozenRecord', 'frozenHash');
    expect(Buffer.from(after.frozenCase).equals(Buffer.from(before.frozenCase))).toBe(true);
    expect(Buffer.from(after.frozenResult).equals(Buffer.from(before.frozenResult))).toBe(true);
    expect(after.frozenHash).toBe(before.frozenHash);
    expect(verifyFrozen(after)).toBe(true);
    const h = await call(history, p(id));
    expect(h.body.frozen).toEqual({ hash: before.frozenHash, verifies: true });

    const stamp = await fetchApprovalStamp(id, k);
    expect(stamp).toMatchObject({ hash: before.frozenHash, verifies: true });
    expect(stamp?.approvedBy.map((a) => a.email)).toEqual(['approver@aldervane.test']);
    expect(stamp?.approvedAt).toMatch(/^\d{4}-\d\d-\d\dT/);

    // One changed byte in the stored result and the hash no longer verifies.
    expect(verifyFrozen({ ...after, frozenResult: after.frozenResult.replace(/\d/, (d: string) => String((Number(d) + 1) % 10)) })).toBe(false);

    // "New revision" copies into a draft; the frozen original stays as it was.
    signInAs(ids['analyst@aldervane.test']);
    const rev = await call(revise, p(id), { method: 'POST' });
    expect(rev.status).toBe(201);
    const copy = await k('business_cases').where({ id: rev.body.id }).first();
    expect(copy).toMatchObject({ status: 'draft', revisionOf: id, frozenHash: null, name: 'Frozen case (rev. 2)' });
    expect((await k('business_cases').where({ id }).first('frozenHash')).frozenHash).toBe(before.frozenHash);
  });

  it('needs a reason to reject or send back; a returned case can be resubmitted and earlier approvals no longer count', async () => {
    await k('workspaces').where({ slug: WS }).update({ settings: JSON.stringify({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 2 }) });
    const id = await insertDraftCase(k, WS, 'Sent back');
    signInAs(ids['analyst@aldervane.test']);
    await call(submit, p(id), { body: {} });
    signInAs(ids['approver@aldervane.test']);
    await call(decide, p(id), { body: { decision: 'approve' } });
    signInAs(ids['admin@aldervane.test']);
    const noReason = await call(decide, p(id), { body: { decision: 'return', comment: '  ' } });
    expect(noReason.status).toBe(422);
    expect(noReason.body.problems[0].path).toBe('comment');
    expect((await call(decide, p(id), { body: { decision: 'return', comment: 'Use the high-fuel set too.' } })).body.status).toBe('returned');
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: { comment: 'Added.' } })).body.status).toBe('submitted');
    const h = await call(history, p(id));
    expect(h.body.approvedBy).toEqual([]);
    expect(h.body.events.map((e: { action: string }) => e.action)).toEqual(['submit', 'approve', 'return', 'submit']);
    signInAs(ids['approver@aldervane.test']);
    expect((await call(decide, p(id), { body: { decision: 'reject', comment: 'Payback too long.' } })).body.status).toBe('rejected');
    expect((await call(decide, p(id), { body: { decision: 'approve' } })).status).toBe(409);
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: {} })).status).toBe(409);
    expect((await call(revise, p(id), { method: 'POST' })).status).toBe(201);
    await k('workspaces').where({ slug: WS }).update({ settings: JSON.stringify({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 1 }) });
  });

  it('answers 409 on a stale version', async () => {
    const id = await insertDraftCase(k, WS, 'Stale');
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: { version: 7 } })).status).toBe(409);
    expect((await call(submit, p(id), { body: { version: 1 } })).status).toBe(200);
  });

  it('lets only an admin set how many approvers a case needs, validated and audited', async () => {
    signInAs(ids['approver@aldervane.test']);
    expect((await call(putApprovals, { workspace: WS }, { method: 'PUT', body: { approvalsRequired: 2 } })).status).toBe(403);
    signInAs(ids['admin@aldervane.test']);
    const bad = await call(putApprovals, { workspace: WS }, { method: 'PUT', body: { approvalsRequired: 0 } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems).toEqual([{ path: 'approvalsRequired', message: 'At least one approval is needed.' }]);
    expect((await call(putApprovals, { workspace: WS }, { method: 'PUT', body: { approvalsRequired: 3 } })).status).toBe(200);
    const settings = JSON.parse((await k('workspaces').where({ slug: WS }).first('settings')).settings);
    expect(settings).toEqual({ units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 3 });
    const audit = await k('audit_log').where({ entity: 'workspace_settings' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.after)).toEqual({ approvalsRequired: 3 });
    await call(putApprovals, { workspace: WS }, { method: 'PUT', body: { approvalsRequired: 1 } });
  });
});
