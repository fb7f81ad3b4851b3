import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { writeAudit } from '@/lib/audit';
import { ACCOUNT_MAIL_WITHHELD } from '@/lib/mail/outbox';
import { GET as auditJson } from '@/app/api/workspaces/[workspace]/audit/route';
import { GET as auditCsv } from '@/app/api/workspaces/[workspace]/audit/csv/route';
import { GET as outbox } from '@/app/api/workspaces/[workspace]/outbox/route';
import { POST as invite } from '@/app/api/workspaces/[workspace]/invitations/route';
import { POST as forgot } from '@/app/api/password/forgot/route';
import { settlePasswordResetRequests } from '@/lib/accounts/password-reset';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = { workspace: 'aldervane-north-pit' };
const url = (q: string) => `http://127.0.0.1/api/workspaces/aldervane-north-pit/audit?${q}`;
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('audit log and outbox on $name', ({ pg }) => {
  let k: Knex;
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;

  beforeAll(async () => {
    ({ k, close, ids } = await openMailDb(pg));
    wsId = (await k('workspaces').where({ slug: 'aldervane-north-pit' }).first('id')).id;
    await writeAudit(k, { workspaceId: wsId, userId: ids['analyst@aldervane.test'], action: 'update', entity: 'truck', entityId: 'T301', before: { notes: 'ok' }, after: { notes: '=HYPERLINK("http://evil.test")' } });
    await k('audit_log').insert({ workspaceId: wsId, userId: ids['approver@aldervane.test'], action: 'approve', entity: 'business_case', entityId: '9', before: null, after: '{"status":"approved"}', at: '2026-01-15T10:00:00.000Z' });
    const corrin = (await k('workspaces').where({ slug: 'corrin-flats' }).first('id')).id;
    await writeAudit(k, { workspaceId: corrin, userId: ids['analyst@aldervane.test'], action: 'update', entity: 'truck', entityId: 'C1', after: { secret: 'corrin only' } });
  });
  afterAll(async () => {
    await close();
  });

  it('lets admins, approvers and analysts read it, not viewers; addresses only for admins, names for the others', async () => {
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(auditJson, WS, { url: url('') })).status).toBe(403);
    expect((await call(auditCsv, WS, { url: url('') })).status).toBe(403);
    await writeAudit(k, { workspaceId: wsId, userId: ids['admin@aldervane.test'], action: 'change-role', entity: 'membership', entityId: ids['viewer@aldervane.test'], before: { email: 'viewer@aldervane.test', role: 'viewer' }, after: { email: 'viewer@aldervane.test', role: 'analyst' } });
    for (const role of ['approver', 'analyst']) {
      signInAs(ids[`${role}@aldervane.test`]);
      const r = await call(auditJson, WS, { url: url('kind=membership:change-role') });
      expect(r.status).toBe(200);
      expect(JSON.stringify(r.body)).not.toMatch(/@aldervane\.test/);
      expect(r.body.rows[0]).toMatchObject({ who: 'Demo admin', what: 'Member Demo viewer', kind: 'Member: role changed', before: '{"role":"viewer"}', after: '{"role":"analyst"}' });
      const csv = await call(auditCsv, WS, { url: url('kind=membership') });
      expect(csv.status).toBe(200);
      expect(csv.body).not.toMatch(/@aldervane\.test/);
    }
    signInAs(ids['admin@aldervane.test']);
    const admin = await call(auditJson, WS, { url: url('kind=membership:change-role') });
    expect(admin.body.rows[0]).toMatchObject({ who: 'admin@aldervane.test', what: 'Member Demo viewer' });
    expect(admin.body.rows[0].after).toContain('viewer@aldervane.test');
    await k('audit_log').where({ action: 'change-role' }).delete();
  });

  it('names the truck and case a row is about, from the register when it is still there', async () => {
    signInAs(ids['analyst@aldervane.test']);
    const truck = await k('trucks').where({ workspaceId: wsId }).orderBy('unitNumber').first('id', 'unitNumber');
    const kase = await k('business_cases').where({ workspaceId: wsId }).first('id', 'name');
    await writeAudit(k, { workspaceId: wsId, userId: ids['analyst@aldervane.test'], action: 'update', entity: 'truck', entityId: truck.id, before: { unitNumber: truck.unitNumber, engineHours: 1 }, after: { unitNumber: truck.unitNumber, engineHours: 2 } });
    await writeAudit(k, { workspaceId: wsId, userId: ids['analyst@aldervane.test'], action: 'update-plan', entity: 'business_case', entityId: kase.id, before: { name: kase.name, plan: {} }, after: { name: kase.name, plan: { swapsPerMonth: 1 } } });
    await writeAudit(k, { workspaceId: wsId, userId: ids['analyst@aldervane.test'], action: 'delete', entity: 'truck', entityId: 987654, before: { unitNumber: 'GONE-1' } });
    const r = await call(auditJson, WS, { url: url('') });
    expect(r.body.rows.slice(0, 3).map((x: { what: string; kind: string }) => `${x.kind} / ${x.what}`)).toEqual([
      'Truck: deleted / Truck GONE-1',
      `Business case: plan changed / Business case “${kase.name}”`,
      `Truck: changed / Truck ${truck.unitNumber}`,
    ]);
    await k('audit_log').whereIn('entityId', [String(truck.id), String(kase.id), '987654']).delete();
  });

  it('filters by person, kind and date range, within this workspace only', async () => {
    signInAs(ids['approver@aldervane.test']);
    const all = await call(auditJson, WS, { url: url('') });
    expect(all.status).toBe(200);
    expect(JSON.stringify(all.body)).not.toContain('corrin only');
    const byPerson = await call(auditJson, WS, { url: url(`user=${ids['analyst@aldervane.test']}`) });
    expect(byPerson.body.rows.map((r: { entityId: string }) => r.entityId)).toEqual(['T301']);
    const byKind = await call(auditJson, WS, { url: url('kind=business_case:approve') });
    expect(byKind.body.total).toBe(1);
    const byDate = await call(auditJson, WS, { url: url('from=2026-01-15&to=2026-01-15') });
    expect(byDate.body.rows.map((r: { entityId: string }) => r.entityId)).toEqual(['9']);
    const bad = await call(auditJson, WS, { url: url('from=2026-02-01&to=2026-01-01&user=abc') });
    expect(bad.status).toBe(422);
    expect(bad.body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['user']);
    const backwards = await call(auditJson, WS, { url: url('from=2026-02-01&to=2026-01-01') });
    expect(backwards.body.problems).toEqual([{ path: 'to', message: 'The end date is before the start date.' }]);
    signInAs(null);
    expect((await call(auditJson, WS, { url: url('') })).status).toBe(401);
  });

  it('downloads CSV with formula-looking cells escaped', async () => {
    signInAs(ids['admin@aldervane.test']);
    await writeAudit(k, { workspaceId: wsId, userId: ids['admin@aldervane.test'], action: 'delete', entity: 'truck', entityId: '=1+cmd', before: '-5' });
    const r = await call(auditCsv, WS, { url: url('kind=truck') });
    expect(r.status).toBe(200);
    expect(r.response.headers.get('content-type')).toMatch(/text\/csv/);
    expect(r.response.headers.get('content-disposition')).toMatch(/attachment; filename="haulcase-audit-aldervane-north-pit-/);
    const lines = (r.body as string).trim().split('\r\n');
    expect(lines[0]).toBe('id,at (UTC),who,change,what,action,entity,entity id,before,after');
    expect(lines).toHaveLength(3);
    // An entity id typed as "=1+cmd" comes out as inert text.
    expect(lines[1]).toContain(",Truck: deleted,Truck #=1+cmd,delete,truck,'=1+cmd,");
    expect(lines[2]).toContain('analyst@aldervane.test,Truck: changed,Truck #T301,update,truck,T301');
    // The after cell is JSON starting with "{", so not a formula; a raw "=..." value would be prefixed.
    expect(lines[2]).toContain('"{""notes"":""=HYPERLINK(\\""http://evil.test\\"")""}"');
  });

  it('shows the outbox to admins only: this workspace\'s mail and its members\' account mail', async () => {
    signInAs(ids['admin@aldervane.test']);
    await call(invite, WS, { body: { email: 'new.analyst@aldervane.test', role: 'analyst' } });
    signInAs(ids['admin@corrin.test']);
    await call(invite, { workspace: 'corrin-flats' }, { body: { email: 'someone@corrin.test', role: 'viewer' } });
    signInAs(null);
    await call(forgot, {}, { body: { email: 'viewer@aldervane.test' } });
    await call(forgot, {}, { body: { email: 'admin@corrin.test' } });
    await settlePasswordResetRequests(); // the resets are written after the answers

    signInAs(ids['analyst@aldervane.test']);
    expect((await call(outbox, WS)).status).toBe(403);
    signInAs(ids['admin@aldervane.test']);
    const r = await call(outbox, WS);
    expect(r.status).toBe(200);
    const seen = r.body.messages.map((m: { to: string[]; subject: string }) => `${m.to[0]}: ${m.subject}`);
    expect(seen).toEqual(['viewer@aldervane.test: Reset your Haulcase password', 'new.analyst@aldervane.test: You are invited to Aldervane Copper — North Pit on Haulcase']);
    // Regression: the reset link was readable here, so an admin could take over a member's account.
    const reset = r.body.messages[0];
    expect(reset.text).toBe(ACCOUNT_MAIL_WITHHELD);
    expect(JSON.stringify(reset)).not.toMatch(/reset-password\//);
    expect(r.body.messages[1].text).toMatch(/\/invite\//);
  });
});
