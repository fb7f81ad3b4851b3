import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { clientAddress, UNKNOWN_ADDRESS } from '@/lib/auth/throttle';
import { verifyPassword } from '@/lib/auth/password';
import { DEMO_PASSWORD } from '@/db/seeds/demo';
import { GET as getMembers } from '@/app/api/workspaces/[workspace]/members/route';
import { GET as getWorkspace } from '@/app/api/workspaces/[workspace]/route';
import { GET as getMyWorkspaces } from '@/app/api/me/workspaces/route';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('access checks and migrations on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
  });
  afterAll(async () => destroy());

  it('runs on the expected database client', () => {
    expect(k.client.config.client).toBe(pg ? 'pg' : 'better-sqlite3');
  });

  it('answers 401 to a signed-out caller', async () => {
    signInAs(null);
    const r = await call(getWorkspace, { workspace: 'aldervane-north-pit' });
    expect(r.status).toBe(401);
    expect(r.body.error).toMatch(/sign in/i);
    expect((await call(getMyWorkspaces, {})).status).toBe(401);
  });

  it('lets every role read its own workspace and reports the role from the database', async () => {
    for (const role of ['admin', 'analyst', 'approver', 'viewer']) {
      signInAs(ids[`${role}@aldervane.test`]);
      const r = await call(getWorkspace, { workspace: 'aldervane-north-pit' });
      expect(r.status).toBe(200);
      expect(r.body.role).toBe(role);
      expect(r.body.counts.trucks).toBe(24);
    }
  });

  it('answers 403 when the role is not allowed (viewer asks for the member list)', async () => {
    signInAs(ids['viewer@aldervane.test']);
    const r = await call(getMembers, { workspace: 'aldervane-north-pit' });
    expect(r.status).toBe(403);
    signInAs(ids['admin@aldervane.test']);
    const ok = await call(getMembers, { workspace: 'aldervane-north-pit' });
    expect(ok.status).toBe(200);
    expect(ok.body.members.map((m: { email: string }) => m.email)).toContain('viewer@aldervane.test');
  });

  it('answers 403 for another workspace, and for one that does not exist', async () => {
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(getWorkspace, { workspace: 'corrin-flats' })).status).toBe(403);
    expect((await call(getWorkspace, { workspace: 'no-such-place' })).status).toBe(403);
    // The consultant-analyst belongs to both sites, with a role in each.
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(getWorkspace, { workspace: 'corrin-flats' })).status).toBe(200);
    const mine = await call(getMyWorkspaces, {});
    expect(mine.body.workspaces.map((w: { slug: string }) => w.slug).sort()).toEqual(['aldervane-north-pit', 'corrin-flats']);
  });

  it('reads a role change at the next request (the role is never cached in the token)', async () => {
    const uid = ids['approver@aldervane.test'];
    const wsId = (await k('workspaces').where({ slug: 'aldervane-north-pit' }).first('id')).id;
    signInAs(uid);
    expect((await call(getMembers, { workspace: 'aldervane-north-pit' })).status).toBe(403);
    await k('memberships').where({ userId: uid, workspaceId: wsId }).update({ role: 'admin' });
    expect((await call(getMembers, { workspace: 'aldervane-north-pit' })).status).toBe(200);
    await k('memberships').where({ userId: uid, workspaceId: wsId }).update({ role: 'approver' });
  });

  it('stores demo passwords hashed, never in clear', async () => {
    const u = await k('users').where({ email: 'admin@aldervane.test' }).first();
    expect(u.passwordHash).not.toContain(DEMO_PASSWORD);
    expect(u.passwordHash).toMatch(/^\$2[aby]\$/);
    expect(await verifyPassword(DEMO_PASSWORD, u.passwordHash)).toBe(true);
    expect(await verifyPassword('wrong', u.passwordHash)).toBe(false);
  });

  it('reads forwarding headers only behind a trusted proxy, and then its own (right-most) entry', () => {
    const h = new Headers({ 'x-forwarded-for': '203.0.113.7, 198.51.100.2' });
    expect(clientAddress(h, {})).toBe(UNKNOWN_ADDRESS);
    expect(clientAddress(h, { HAULCASE_TRUSTED_PROXY: '1' })).toBe('198.51.100.2');
    expect(clientAddress(new Headers(), { HAULCASE_TRUSTED_PROXY: '1' })).toBe(UNKNOWN_ADDRESS);
  });

  it('rolls every migration back and forward again', async () => {
    await k.migrate.rollback(undefined, true);
    const [, pending] = await k.migrate.list();
    expect(pending.length).toBeGreaterThanOrEqual(3);
    await k.migrate.latest();
    const [done, left] = await k.migrate.list();
    expect(left).toEqual([]);
    expect(done.length).toBe(pending.length);
  });
});
