import 'server-only';
import type { Access } from '@/lib/auth/access';
import { hashPassword } from '@/lib/auth/password';
import { ROLE_LABELS, type Role } from '@/lib/auth/roles';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { HttpError, invalid } from '@/lib/http';
import { readMailConfig } from '@/lib/mail/config';
import { invitationMail } from '@/lib/mail/messages';
import { enqueueMail, mailCommitted } from '@/lib/mail/queue';
import { nowIso } from '@/lib/time';
import { addMinutes, assertUsable, hashToken, INVITATION_DAYS, newToken } from './tokens';

const insertedId = (row: unknown) => (typeof row === 'object' && row ? (row as { id: number }).id : (row as number));

/** Admin invites an address with a role: a hashed single-use token, 7 days, mailed as a link. */
export async function createInvitation(access: Access, input: { email: string; role: Role }) {
  const k = db();
  const token = newToken();
  const expiresAt = addMinutes(new Date(), INVITATION_DAYS * 24 * 60);
  const id = await k.transaction(async (trx) => {
    const member = await trx('memberships as m').join('users as u', 'u.id', 'm.userId').where({ 'm.workspaceId': access.workspace.id, 'u.email': input.email }).first('m.id', 'm.role');
    if (member) {
      const now = ROLE_LABELS[member.role as Role] ?? member.role;
      const message = member.role === input.role
        ? `${input.email} is already a member of this workspace (${now}).`
        : `${input.email} is already a member of this workspace (${now}). To make them ${ROLE_LABELS[input.role].toLowerCase()}, change their role in the members table instead of inviting them.`;
      throw invalid([{ path: 'email', message }], message);
    }
    const [row] = await trx('invitations')
      .insert({ workspaceId: access.workspace.id, email: input.email, role: input.role, tokenHash: hashToken(token), expiresAt, invitedBy: access.userId, createdAt: nowIso() })
      .returning('id');
    const newId = insertedId(row);
    await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'invite', entity: 'invitation', entityId: newId, after: { email: input.email, role: input.role, expiresAt } });
    // the link's mail is written with the invitation: both are saved, or neither
    const inviter = await trx('users').where({ id: access.userId }).first('name', 'email');
    const body = invitationMail({ workspaceName: access.workspace.name, inviter: inviter?.name || inviter?.email || 'An admin', role: input.role, link: `${readMailConfig().appUrl}/invite/${token}`, expiresAt });
    await enqueueMail(trx, { ...body, to: [input.email], workspace: access.workspace.slug });
    return newId;
  });
  await mailCommitted();
  return { id, email: input.email, role: input.role, expiresAt, mailQueued: true };
}

export async function fetchPendingInvitations(workspaceId: number) {
  return db()('invitations').where({ workspaceId }).whereNull('usedAt').where('expiresAt', '>', nowIso()).orderBy('id', 'desc').select('id', 'email', 'role', 'expiresAt', 'createdAt');
}

/** What the accept page shows before anyone acts: the workspace, role, and whether an account exists. */
export async function describeInvitation(token: string) {
  const row = await db()('invitations as i').join('workspaces as w', 'w.id', 'i.workspaceId').where('i.tokenHash', hashToken(token)).first('i.*', 'w.name as workspaceName', 'w.slug');
  assertUsable(row, 'invitation');
  const user = await db()('users').where({ email: row.email }).first('id');
  return { email: row.email as string, role: row.role as Role, workspaceName: row.workspaceName as string, slug: row.slug as string, accountExists: Boolean(user) };
}

/**
 * Accepts an invitation. A new address gets an account (name + password); an
 * existing account must be signed in as that address first. Membership and the
 * token's use are saved together; a token that was used meanwhile is refused.
 */
export async function acceptInvitation(input: { token: string; name?: string; password?: string }, sessionUserId: number | null) {
  return db().transaction(async (trx) => {
    const row = await trx('invitations as i').join('workspaces as w', 'w.id', 'i.workspaceId').where('i.tokenHash', hashToken(input.token)).first('i.*', 'w.slug');
    assertUsable(row, 'invitation');
    const at = nowIso();
    let user = await trx('users').where({ email: row.email }).first('id');
    let created = false;
    if (user) {
      if (sessionUserId === null) throw new HttpError(401, `An account for ${row.email} exists: sign in as ${row.email}, then open the link again.`);
      if (sessionUserId !== user.id) throw new HttpError(403, `This invitation is for ${row.email}. Sign out and sign in as that address.`);
    } else {
      const problems = [
        ...(input.name ? [] : [{ path: 'name', message: 'Enter your name.' }]),
        ...(input.password ? [] : [{ path: 'password', message: 'Choose a password of at least 10 characters.' }]),
      ];
      if (problems.length) throw invalid(problems);
      const [u] = await trx('users').insert({ email: row.email, name: input.name, passwordHash: await hashPassword(input.password as string), passwordChangedAt: at, createdAt: at, updatedAt: at }).returning('id');
      user = { id: insertedId(u) };
      created = true;
    }
    const used = await trx('invitations').where({ id: row.id }).whereNull('usedAt').update({ usedAt: at });
    if (used !== 1) throw new HttpError(410, 'This invitation link has already been used. Links work once.');
    const existing = await trx('memberships').where({ workspaceId: row.workspaceId, userId: user.id }).first('id');
    if (!existing) await trx('memberships').insert({ workspaceId: row.workspaceId, userId: user.id, role: row.role, createdAt: at });
    await writeAudit(trx, { workspaceId: row.workspaceId, userId: user.id, action: 'accept', entity: 'invitation', entityId: row.id, after: { email: row.email, role: row.role, accountCreated: created } });
    if (!existing) await writeAudit(trx, { workspaceId: row.workspaceId, userId: user.id, action: 'create', entity: 'membership', entityId: user.id, after: { email: row.email, role: row.role } });
    return { slug: row.slug as string, email: row.email as string, created };
  });
}
