import 'server-only';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { readMailConfig } from '@/lib/mail/config';
import { caseDecidedMail, caseSubmittedMail } from '@/lib/mail/messages';
import { enqueueMail } from '@/lib/mail/queue';
import type { Decision } from './workflow';

type Row = { id: number; name: string; submittedBy: number | null };

const caseLink = (slug: string, id: number) => `${readMailConfig().appUrl}/${slug}/approvals/${id}`;

async function personName(trx: Knex, userId: number): Promise<string> {
  const u = await trx('users').where({ id: userId }).first('name', 'email');
  return u ? u.name || u.email : 'Someone';
}

/**
 * Mail to the workspace's approvers (admins decide too, but are only written to
 * when there is no approver), never to the submitter. Written to the outbox in
 * the submitting transaction `trx`; sent once it has committed.
 */
export async function notifySubmitted(trx: Knex, access: Access, row: Row, comment: string) {
  const members = await trx('memberships as m')
    .join('users as u', 'u.id', 'm.userId')
    .where('m.workspaceId', access.workspace.id)
    .whereIn('m.role', ['approver', 'admin'])
    .whereNot('u.id', access.userId)
    .select('u.email', 'm.role');
  const approvers = members.filter((m) => m.role === 'approver');
  const to = (approvers.length ? approvers : members).map((m) => m.email as string);
  const body = caseSubmittedMail({
    workspaceName: access.workspace.name, caseName: row.name, submitter: await personName(trx, access.userId), comment, link: caseLink(access.workspace.slug, row.id),
  });
  await enqueueMail(trx, { ...body, to, workspace: access.workspace.slug });
  return { queued: to.length > 0, to };
}

/** Mail to whoever submitted the round, written in the deciding transaction `trx`. */
export async function notifyDecision(trx: Knex, access: Access, row: Row, decision: Decision, final: boolean, comment: string) {
  if (row.submittedBy == null) return { queued: false, to: [] as string[] };
  const submitter = await trx('users').where({ id: row.submittedBy }).first('email');
  if (!submitter) return { queued: false, to: [] as string[] };
  const body = caseDecidedMail({
    workspaceName: access.workspace.name, caseName: row.name, decider: await personName(trx, access.userId), decision, final, comment, link: caseLink(access.workspace.slug, row.id),
  });
  await enqueueMail(trx, { ...body, to: [submitter.email], workspace: access.workspace.slug });
  return { queued: true, to: [submitter.email as string] };
}
