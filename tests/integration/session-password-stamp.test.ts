import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import type { Session } from 'next-auth';
import type { JWT } from 'next-auth/jwt';
import { useDbForTests } from '@/lib/db';
import { resetPassword } from '@/lib/accounts/password-reset';
import { addMinutes, hashToken, newToken } from '@/lib/accounts/tokens';
import { isSessionCurrent } from '@/lib/auth/session-current';
import { DEMO_PASSWORD } from '@/db/seeds/demo';
import { createTestDb } from '../support/test-db';

// getSessionUserId reads next-auth's session; here it is whatever the test holds.
const held = vi.hoisted(() => ({ session: null as unknown }));
vi.mock('next-auth', () => ({ getServerSession: vi.fn(async () => held.session) }));

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('a password reset ends the sessions signed in before it on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let userId: number;

  beforeAll(async () => {
    process.env.NEXTAUTH_SECRET ??= 'integration-test-secret';
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    userId = (await k('users').where({ email: 'viewer@aldervane.test' }).first('id')).id;
  });
  afterAll(async () => destroy());

  const reset = async () => {
    const token = newToken();
    await k('password_resets').insert({ userId, tokenHash: hashToken(token), expiresAt: addMinutes(new Date(), 30), createdAt: new Date().toISOString() });
    await resetPassword(token, 'a-brand-new-password');
    return (await k('users').where({ id: userId }).first('passwordChangedAt')).passwordChangedAt as string;
  };

  it('keeps a session whose stamp matches, ends it after a reset, and accepts a session signed in after the reset', async () => {
    // seeded users have never reset: a token without a stamp still stands
    expect(await isSessionCurrent(userId, { passwordChangedAt: undefined }, k)).toBe(true);
    expect(await isSessionCurrent(userId, { passwordChangedAt: null }, k)).toBe(true);
    const stamp = await reset();
    expect(stamp).toMatch(/^\d{4}-\d\d-\d\dT/);
    expect(await isSessionCurrent(userId, { passwordChangedAt: null }, k)).toBe(false);
    expect(await isSessionCurrent(userId, { passwordChangedAt: stamp }, k)).toBe(true);
    // a second reset ends the session signed in after the first
    const next = await reset();
    expect(next).not.toBe(stamp);
    expect(await isSessionCurrent(userId, { passwordChangedAt: stamp }, k)).toBe(false);
    expect(await isSessionCurrent(userId, { passwordChangedAt: next }, k)).toBe(true);
    expect(await isSessionCurrent(999999, { passwordChangedAt: null }, k)).toBe(false);
  });

  it('carries the stamp from sign-in into the token and the session, and getSessionUserId treats a stale one as signed out', async () => {
    const { authOptions } = await import('@/lib/auth/options');
    const { getSessionUserId } = await import('@/lib/auth/session');
    const { passwordChangedAt } = await k('users').where({ id: userId }).first('passwordChangedAt');
    const jwt = authOptions.callbacks!.jwt!;
    const sessionCb = authOptions.callbacks!.session!;
    const token = (await jwt({ token: {}, user: { id: String(userId), passwordChangedAt }, account: null } as Parameters<typeof jwt>[0])) as JWT;
    expect(token).toMatchObject({ uid: userId, pwc: passwordChangedAt });
    // later requests carry no user: the token keeps its stamp
    expect(await jwt({ token, account: null } as unknown as Parameters<typeof jwt>[0])).toMatchObject({ pwc: passwordChangedAt });
    const session = (await sessionCb({ session: { user: {}, expires: '' }, token } as unknown as Parameters<typeof sessionCb>[0])) as Session;
    expect(session.user).toEqual({ id: userId, passwordChangedAt, sessionStamp: null });

    held.session = session;
    expect(await getSessionUserId()).toBe(userId);
    await reset();
    expect(await getSessionUserId()).toBeNull();
    held.session = null;
    expect(await getSessionUserId()).toBeNull();
  });

  it('a sign-out ends the session: the token from before it (a copied cookie) is then signed out, for getSessionUserId and requireMember', async () => {
    const { authOptions } = await import('@/lib/auth/options');
    const { getSessionUserId } = await import('@/lib/auth/session');
    const { requireMember } = await import('@/lib/auth/access');
    type Authorize = (c: Record<string, string>, req: { headers: Record<string, string> }) => Promise<{ id: string } | null>;
    const authorize = (authOptions.providers[0] as unknown as { options: { authorize: Authorize } }).options.authorize;
    const jwt = authOptions.callbacks!.jwt!;
    const sessionCb = authOptions.callbacks!.session!;
    const signOut = authOptions.events!.signOut!;
    const approverId = (await k('users').where({ email: 'approver@aldervane.test' }).first('id')).id as number;
    // what next-auth does on sign-in: authorize, then the jwt callback with the user, then the session callback per request
    const signIn = async () => {
      const user = await authorize({ email: 'approver@aldervane.test', password: DEMO_PASSWORD }, { headers: {} });
      expect(user).toMatchObject({ id: String(approverId) });
      const token = (await jwt({ token: {}, user, account: null } as unknown as Parameters<typeof jwt>[0])) as JWT;
      const session = (await sessionCb({ session: { user: {}, expires: '' }, token } as unknown as Parameters<typeof sessionCb>[0])) as Session;
      return { token, session };
    };
    const first = await signIn();
    held.session = first.session;
    expect(await getSessionUserId()).toBe(approverId);
    expect((await requireMember('aldervane-north-pit')).role).toBe('approver');

    // next-auth calls events.signOut with the decoded token of the cookie it clears
    await signOut({ token: first.token } as Parameters<typeof signOut>[0]);
    const { sessionStamp } = await k('users').where({ id: approverId }).first('sessionStamp');
    expect(sessionStamp).toEqual(expect.any(String));
    // the copied cookie decodes as before, but no longer counts
    expect(await getSessionUserId()).toBeNull();
    await expect(requireMember('aldervane-north-pit')).rejects.toMatchObject({ status: 401 });

    // a new sign-in carries the new stamp
    const second = await signIn();
    expect(second.token.sst).toBe(sessionStamp);
    held.session = second.session;
    expect(await getSessionUserId()).toBe(approverId);
    // signing out with the stale copy does not end the newer session
    await signOut({ token: first.token } as Parameters<typeof signOut>[0]);
    expect(await getSessionUserId()).toBe(approverId);
    await signOut({ token: second.token } as Parameters<typeof signOut>[0]);
    expect(await getSessionUserId()).toBeNull();
    held.session = null;
  });
});
