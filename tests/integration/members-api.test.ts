import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { GET as getMembers } from '@/app/api/workspaces/[workspace]/members/route';
import { DELETE as removeMember, PATCH as changeRole } from '@/app/api/workspaces/[workspace]/members/[userId]/route';
import { POST as invite } from '@/app/api/workspaces/[workspace]/invitations/route';
import { GET as getWorkspace } from '@/app/api/workspaces/[workspace]/route';
import { GET as listTrucks, POST as createTruck } from '@/app/api/workspaces/[workspace]/trucks/route';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('changing roles and removing members on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number> = {};
  const version = async (userId: number) => (await k('memberships').where({ userId }).whereIn('workspaceId', k('workspaces').where({ slug: WS }).select('id')).first('version'))?.version as number;
  const patch = (userId: number, body: unknown) => call(changeRole, { workspace: WS, userId: String(userId) }, { method: 'PATCH', body });
  const del = (userId: number, query: string) => call(removeMember, { workspace: WS, userId: String(userId) }, { method: 'DELETE', url: `http://127.0.0.1/api/test${query}`, body: {} });

  beforeAll(async () => {
    const t = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined });
    k = t.k;
    destroy = t.destroy;
    useDbForTests(k);
    ids = await userIds(k);
  });
  afterAll(async () => destroy());

  it('lets only an admin change a role or remove a member', async () => {
    for (const role of ['analyst', 'approver', 'viewer']) {
      signInAs(ids[`${role}@aldervane.test`]);
      expect((await patch(ids['viewer@aldervane.test'], { role: 'analyst', version: 1 })).status).toBe(403);
      expect((await del(ids['viewer@aldervane.test'], '?version=1')).status).toBe(403);
    }
    expect(await version(ids['viewer@aldervane.test'])).toBe(1);
  });

  it('changes a role, bumps the version, audits it, and the member is checked against the new role at once', async () => {
    const viewer = ids['viewer@aldervane.test'];
    signInAs(viewer);
    expect((await call(createTruck, { workspace: WS }, { body: {} })).status).toBe(403);

    signInAs(ids['admin@aldervane.test']);
    const r = await patch(viewer, { role: 'analyst', version: 1 });
    expect(r.status).toBe(200);
    expect(r.body).toEqual({ userId: viewer, role: 'analyst', version: 2 });
    const audit = await k('audit_log').where({ entity: 'membership', action: 'change-role' }).orderBy('id', 'desc').first();
    expect(audit.userId).toBe(ids['admin@aldervane.test']);
    expect(JSON.parse(audit.before)).toEqual({ email: 'viewer@aldervane.test', role: 'viewer' });
    expect(JSON.parse(audit.after)).toEqual({ email: 'viewer@aldervane.test', role: 'analyst' });

    // the same session, no new sign-in: the role comes from the database on the next request
    signInAs(viewer);
    expect((await call(getWorkspace, { workspace: WS })).body.role).toBe('analyst');
    const create = await call(createTruck, { workspace: WS }, { body: {} });
    expect(create.status).toBe(422); // allowed now; the empty body is refused as invalid, not forbidden
  });

  it('tells an admin who invites an existing member to another role to change the role instead', async () => {
    signInAs(ids['admin@aldervane.test']);
    const r = await call(invite, { workspace: WS }, { body: { email: 'approver@aldervane.test', role: 'analyst' } });
    expect(r.status).toBe(422);
    expect(r.body.problems[0]).toEqual({
      path: 'email',
      message: 'approver@aldervane.test is already a member of this workspace (Approver). To make them analyst, change their role in the members table instead of inviting them.',
    });
  });

  it('answers 409 to a stale version and 422 to a bad role or missing version, and changes nothing', async () => {
    signInAs(ids['admin@aldervane.test']);
    const viewer = ids['viewer@aldervane.test'];
    const stale = await patch(viewer, { role: 'approver', version: 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error).toMatch(/reload/i);
    const bad = await patch(viewer, { role: 'owner', version: 2 });
    expect(bad.status).toBe(422);
    expect(bad.body.problems[0]).toMatchObject({ path: 'role', message: 'Choose admin, analyst, approver or viewer.' });
    expect((await patch(viewer, { role: 'approver' })).body.problems[0].path).toBe('version');
    expect((await del(viewer, '')).body.problems[0].path).toBe('version');
    expect((await del(viewer, '?version=1')).status).toBe(409);
    expect((await patch(999999, { role: 'viewer', version: 1 })).status).toBe(404);
    expect((await patch(Number.NaN, { role: 'viewer', version: 1 })).status).toBe(404);
    expect(await version(viewer)).toBe(2);
  });

  it('refuses to demote or remove the last admin with a plain 409, and allows it once there is another admin', async () => {
    const admin = ids['admin@aldervane.test'];
    signInAs(admin);
    const demote = await patch(admin, { role: 'analyst', version: 1 });
    expect(demote.status).toBe(409);
    expect(demote.body.error).toBe('Demo admin is the only admin of this workspace, so they cannot be made analyst. Make another member an admin first.');
    const remove = await del(admin, '?version=1');
    expect(remove.status).toBe(409);
    expect(remove.body.error).toMatch(/only admin .* cannot be removed/);
    expect(await k('memberships').where({ userId: admin }).whereIn('workspaceId', k('workspaces').where({ slug: WS }).select('id')).first('role')).toEqual({ role: 'admin' });

    const approver = ids['approver@aldervane.test'];
    expect((await patch(approver, { role: 'admin', version: 1 })).status).toBe(200);
    expect((await patch(admin, { role: 'analyst', version: 1 })).status).toBe(200);
    // the former admin cannot undo it: the role is read from the database
    expect((await patch(admin, { role: 'admin', version: 2 })).status).toBe(403);
    signInAs(approver);
    expect((await patch(admin, { role: 'admin', version: 2 })).status).toBe(200);
  });

  it('removes a member: audited, gone from the list, and their still-open session gets 403 on its next request', async () => {
    const viewer = ids['viewer@aldervane.test'];
    signInAs(viewer);
    expect((await call(listTrucks, { workspace: WS })).status).toBe(200);

    signInAs(ids['admin@aldervane.test']);
    const r = await del(viewer, `?version=${await version(viewer)}`);
    expect(r.status).toBe(204);
    const audit = await k('audit_log').where({ entity: 'membership', action: 'remove' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.before)).toEqual({ email: 'viewer@aldervane.test', role: 'analyst' });
    expect(audit.after).toBeNull();
    const list = await call(getMembers, { workspace: WS });
    expect(list.body.members.map((m: { email: string }) => m.email)).not.toContain('viewer@aldervane.test');
    expect(await k('users').where({ id: viewer }).first('id')).toBeTruthy(); // the account stays

    signInAs(viewer);
    for (const res of [await call(listTrucks, { workspace: WS }), await call(getWorkspace, { workspace: WS }), await call(createTruck, { workspace: WS }, { body: {} })]) {
      expect(res.status).toBe(403);
      expect(res.body.error).toMatch(/not a member/);
    }
  });
});
