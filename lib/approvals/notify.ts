import 'server-only';
import type { Access } from '@/lib/auth/access';
import { db } from '@/lib/db';
import { readMailConfig } from '@/lib/mail/config';
import { caseDecidedMail, caseSubmittedMail } from '@/lib/mail/messages';
import { sendMail } from '@/lib/mail/send';
import type { Decision } from './workflow';

type Row = { id: number; name: string; submittedBy: number | null };

const caseLink = (slug: string, id: number) => `${readMailConfig().appUrl}/${slug}/approvals/${id}`;

async function personName(userId: number): Promise<string> {
  const u = await db()('users').where({ id: userId }).first('name', 'email');
  return u ? u.name || u.email : 'Someone';
}

/**
 * Mail to the workspace's approvers (admins decide too, but are only written to
 * when there is no approver), never to the submitter. Sent after commit.
 */
export async function notifySubmitted(access: Access, row: Row, comment: string) {
  const members = await db()('memberships as m')
    .join('users as u', 'u.id', 'm.userId')
    .where('m.workspaceId', access.workspace.id)
    .whereIn('m.role', ['approver', 'admin'])
    .whereNot('u.id', access.userId)
    .select('u.email', 'm.role');
  const approvers = members.filter((m) => m.role === 'approver');
  const to = (approvers.length ? approvers : members).map((m) => m.email as string);
  const body = caseSubmittedMail({
    workspaceName: access.workspace.name, caseName: row.name, submitter: await personName(access.userId), comment, link: caseLink(access.workspace.slug, row.id),
  });
  const sent = await sendMail({ ...body, to, workspace: access.workspace.slug });
  return { sent: sent.ok, to };
}

/** Mail to whoever submitted the round. */
export async function notifyDecision(access: Access, row: Row, decision: Decision, final: boolean, comment: string) {
  if (row.submittedBy == null) return { sent: false, to: [] as string[] };
  const submitter = await db()('users').where({ id: row.submittedBy }).first('email');
  if (!submitter) return { sent: false, to: [] as string[] };
  const body = caseDecidedMail({
    workspaceName: access.workspace.name, caseName: row.name, decider: await personName(access.userId), decision, final, comment, link: caseLink(access.workspace.slug, row.id),
  });
  const sent = await sendMail({ ...body, to: [submitter.email], workspace: access.workspace.slug });
  return { sent: sent.ok, to: [submitter.email as string] };
}
