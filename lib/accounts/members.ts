import 'server-only';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { ROLE_LABELS, type Role } from '@/lib/auth/roles';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { isPostgres } from '@/lib/db/connection';
import { conflict, HttpError, notFound } from '@/lib/http';

type Membership = { id: number; userId: number; role: Role; version: number; email: string; name: string };

const lastAdmin = (who: string, doing: string) =>
  new HttpError(409, `${who} is the only admin of this workspace, so they cannot be ${doing}. Make another member an admin first.`);

async function loadMembership(trx: Knex.Transaction, workspaceId: number, userId: number): Promise<Membership> {
  const row = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.userId')
    .where({ 'm.workspaceId': workspaceId, 'm.userId': userId })
    .first('m.id', 'm.userId', 'm.role', 'm.version', 'u.email', 'u.name');
  if (!row) throw notFound('No such member in this workspace.');
  return row as Membership;
}

/**
 * The admins of a workspace, their rows locked on PostgreSQL until the
 * transaction ends (SQLite runs one writing transaction at a time), so two
 * admins demoting each other at once cannot both succeed and leave none.
 */
async function countAdmins(trx: Knex.Transaction, workspaceId: number): Promise<number> {
  const q = trx('memberships').where({ workspaceId, role: 'admin' }).orderBy('id').select('id');
  return ((await (isPostgres(trx) ? q.forUpdate() : q)) as unknown[]).length;
}

const label = (m: Membership) => m.name || m.email;

/**
 * Admin changes a member's role. 404 not a member, 409 stale version, 409 when it
 * would leave the workspace without an admin. The next request of that member
 * is checked against the new role (the access helper reads the role from the
 * database every time). Audited in the same transaction.
 */
export async function changeMemberRole(access: Access, userId: number, input: { role: Role; version: number }) {
  return db().transaction(async (trx) => {
    const before = await loadMembership(trx, access.workspace.id, userId);
    if (before.version !== input.version) throw conflict('This member was changed since you loaded the page. Reload and try again.');
    if (before.role === input.role) return { userId, role: before.role, version: before.version };
    if (before.role === 'admin' && (await countAdmins(trx, access.workspace.id)) <= 1) {
      throw lastAdmin(label(before), `made ${ROLE_LABELS[input.role].toLowerCase()}`);
    }
    const n = await trx('memberships').where({ id: before.id, version: before.version }).update({ role: input.role, version: before.version + 1 });
    if (n !== 1) throw conflict('This member was changed since you loaded the page. Reload and try again.');
    await writeAudit(trx, {
      workspaceId: access.workspace.id, userId: access.userId, action: 'change-role', entity: 'membership', entityId: userId,
      before: { email: before.email, role: before.role }, after: { email: before.email, role: input.role },
    });
    return { userId, role: input.role, version: before.version + 1 };
  });
}

/**
 * Admin removes a member from the workspace (the account stays; other
 * workspaces are untouched). 404, 409 stale, 409 last admin. From the next
 * request on, that person gets 403 here (the access helper finds no
 * membership), so a session still open cannot read or change anything.
 */
export async function removeMember(access: Access, userId: number, version: number) {
  await db().transaction(async (trx) => {
    const before = await loadMembership(trx, access.workspace.id, userId);
    if (before.version !== version) throw conflict('This member was changed since you loaded the page. Reload and try again.');
    if (before.role === 'admin' && (await countAdmins(trx, access.workspace.id)) <= 1) throw lastAdmin(label(before), 'removed');
    if ((await trx('memberships').where({ id: before.id, version }).delete()) !== 1) throw conflict();
    await writeAudit(trx, {
      workspaceId: access.workspace.id, userId: access.userId, action: 'remove', entity: 'membership', entityId: userId,
      before: { email: before.email, role: before.role },
    });
  });
}
