import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { verifyPassword } from '@/lib/auth/password';
import { hashToken } from '@/lib/accounts/tokens';
import { GET as listInvites, POST as invite } from '@/app/api/workspaces/[workspace]/invitations/route';
import { POST as accept } from '@/app/api/invitations/accept/route';
import { POST as forgot } from '@/app/api/password/forgot/route';
import { settlePasswordResetRequests } from '@/lib/accounts/password-reset';
import { POST as reset } from '@/app/api/password/reset/route';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = { workspace: 'aldervane-north-pit' };
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('invitations and password reset by e-mail on $name', ({ pg }) => {
  let k: Knex;
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  const lastMail = async () => k('mail_sink').orderBy('id', 'desc').first();
  const tokenIn = (text: string, path: string) => text.match(new RegExp(`${path}/([A-Za-z0-9_-]+)`))?.[1] as string;

  beforeAll(async () => {
    ({ k, close, ids } = await openMailDb(pg));
  });
  afterAll(async () => {
    await close();
  });

  it('lets only an admin invite, and refuses a bad address with where and what', async () => {
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(invite, WS, { body: { email: 'x@aldervane.test', role: 'viewer' } })).status).toBe(403);
    signInAs(ids['admin@aldervane.test']);
    const bad = await call(invite, WS, { body: { email: 'not an address', role: 'boss' } });
    expect(bad.status).toBe(422);
    expect(bad.body.problems.map((p: { path: string }) => p.path).sort()).toEqual(['email', 'role']);
    const member = await call(invite, WS, { body: { email: 'viewer@aldervane.test', role: 'approver' } });
    expect(member.status).toBe(422);
    expect(member.body.problems[0].message).toMatch(/already a member/);
  });

  it('mails a single-use invitation link, stores only its hash, and creates the account and membership once', async () => {
    signInAs(ids['admin@aldervane.test']);
    const r = await call(invite, WS, { body: { email: 'Second.Approver@aldervane.test', role: 'approver' } });
    expect(r.status).toBe(201);
    const m = await lastMail();
    expect(JSON.parse(m.toAddresses)).toEqual(['second.approver@aldervane.test']);
    expect(m.subject).toBe('You are invited to Aldervane Copper — North Pit on Haulcase');
    expect(m.html).toContain('/invite/');
    const token = tokenIn(m.text, 'http://127.0.0.1/invite');
    expect(token.length).toBeGreaterThanOrEqual(40);
    const row = await k('invitations').where({ id: r.body.id }).first();
    expect(row.tokenHash).toBe(hashToken(token));
    expect(JSON.stringify(row)).not.toContain(token);
    const days = (Date.parse(row.expiresAt) - Date.now()) / 86_400_000;
    expect(days).toBeGreaterThan(6.99);
    expect(days).toBeLessThanOrEqual(7);
    expect((await call(listInvites, WS)).body.invitations.map((i: { email: string }) => i.email)).toContain('second.approver@aldervane.test');

    signInAs(null);
    const missing = await call(accept, {}, { body: { token } });
    expect(missing.status).toBe(422);
    expect(missing.body.problems.map((p: { path: string }) => p.path)).toEqual(['name', 'password']);
    const ok = await call(accept, {}, { body: { token, name: 'Second approver', password: 'a-long-password' } });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ slug: 'aldervane-north-pit', created: true });
    const user = await k('users').where({ email: 'second.approver@aldervane.test' }).first();
    expect(await verifyPassword('a-long-password', user.passwordHash)).toBe(true);
    // the password set through the invitation is stamped like a reset (sessions compare with it)
    expect(user.passwordChangedAt).toMatch(/^\d{4}-\d\d-\d\dT/);
    expect((await k('memberships').where({ userId: user.id }).first()).role).toBe('approver');

    const again = await call(accept, {}, { body: { token, name: 'Someone else', password: 'another-password' } });
    expect(again.status).toBe(410);
    expect(again.body.error).toMatch(/already been used/);
    expect(await k('memberships').where({ userId: user.id }).count<{ n: number }[]>({ n: '*' }).then((x) => Number(x[0].n))).toBe(1);
  });

  it('joins an existing account only when signed in as that address', async () => {
    signInAs(ids['admin@corrin.test']);
    const r = await call(invite, { workspace: 'corrin-flats' }, { body: { email: 'viewer@aldervane.test', role: 'viewer' } });
    expect(r.status).toBe(201);
    const token = tokenIn((await lastMail()).text, '/invite');
    signInAs(null);
    expect((await call(accept, {}, { body: { token } })).status).toBe(401);
    signInAs(ids['approver@aldervane.test']);
    expect((await call(accept, {}, { body: { token } })).status).toBe(403);
    signInAs(ids['viewer@aldervane.test']);
    const ok = await call(accept, {}, { body: { token } });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ slug: 'corrin-flats', created: false });
  });

  it('refuses an expired invitation', async () => {
    signInAs(ids['admin@aldervane.test']);
    const r = await call(invite, WS, { body: { email: 'late@aldervane.test', role: 'viewer' } });
    const token = tokenIn((await lastMail()).text, '/invite');
    await k('invitations').where({ id: r.body.id }).update({ expiresAt: new Date(Date.now() - 1000).toISOString() });
    signInAs(null);
    const late = await call(accept, {}, { body: { token, name: 'Late', password: 'a-long-password' } });
    expect(late.status).toBe(410);
    expect(late.body.error).toMatch(/expired/);
    expect(await k('users').where({ email: 'late@aldervane.test' }).first()).toBeUndefined();
  });

  it('answers the same for a known and an unknown address, and mails a link only to the known one', async () => {
    signInAs(null);
    await k('mail_sink').del();
    const unknown = await call(forgot, {}, { body: { email: 'nobody@aldervane.test' } });
    const known = await call(forgot, {}, { body: { email: 'analyst@aldervane.test' } });
    await settlePasswordResetRequests(); // the reset and its mail are written after the answer
    expect(unknown.status).toBe(200);
    expect(known.body).toEqual(unknown.body);
    const all = await k('mail_sink');
    expect(all).toHaveLength(1);
    expect(JSON.parse(all[0].toAddresses)).toEqual(['analyst@aldervane.test']);
    expect(all[0].subject).toBe('Reset your Haulcase password');
    expect(all[0].workspaceSlug).toBeNull();
  });

  it('resets the password once with the mailed token; the token cannot be reused, and an expired one is refused', async () => {
    await call(forgot, {}, { body: { email: 'analyst@aldervane.test' } });
    await settlePasswordResetRequests();
    const token = tokenIn((await lastMail()).text, '/reset-password');
    const short = await call(reset, {}, { body: { token, password: 'short' } });
    expect(short.status).toBe(422);
    expect(short.body.problems[0].path).toBe('password');
    expect((await call(reset, {}, { body: { token, password: 'new-password-123' } })).status).toBe(200);
    const u = await k('users').where({ email: 'analyst@aldervane.test' }).first();
    expect(await verifyPassword('new-password-123', u.passwordHash)).toBe(true);
    expect(u.passwordChangedAt).toMatch(/^\d{4}-\d\d-\d\dT/);
    const reuse = await call(reset, {}, { body: { token, password: 'third-password-123' } });
    expect(reuse.status).toBe(410);
    expect(await verifyPassword('new-password-123', (await k('users').where({ id: u.id }).first()).passwordHash)).toBe(true);

    await call(forgot, {}, { body: { email: 'analyst@aldervane.test' } });
    await settlePasswordResetRequests();
    const t2 = tokenIn((await lastMail()).text, '/reset-password');
    await k('password_resets').where({ tokenHash: hashToken(t2) }).update({ expiresAt: new Date(Date.now() - 1).toISOString() });
    const expired = await call(reset, {}, { body: { token: t2, password: 'fourth-password-1' } });
    expect(expired.status).toBe(410);
    expect(expired.body.error).toMatch(/expired/);
    // an unknown token is as gone as a used one
    expect((await call(reset, {}, { body: { token: 'x'.repeat(43), password: 'fourth-password-1' } })).status).toBe(410);
  });
});
