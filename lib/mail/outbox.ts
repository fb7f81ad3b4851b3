import 'server-only';
import { db } from '@/lib/db';
import { readMailConfig } from './config';

export type OutboxMessage = { id: number; fromAddress: string; to: string[]; subject: string; text: string; html: string; receivedAt: string };

/** Whether this server sends to the local sink (the outbox exists only then). */
export const outboxEnabled = () => readMailConfig().sink;

/** Shown instead of the body of account mail: its single-use link belongs to the addressee alone. */
export const ACCOUNT_MAIL_WITHHELD =
  'Account message delivered to its addressee. Its single-use link is theirs alone, so its content is not shown here.';

/**
 * What the local sink received for one workspace: mail tagged with it, and
 * account mail (password resets) addressed to one of its members — the latter
 * with its content withheld, or an admin of one workspace could take over a
 * member's account (and with it their roles in other workspaces).
 */
export async function fetchOutbox(workspaceId: number, slug: string, limit = 100): Promise<OutboxMessage[]> {
  const k = db();
  const emails = new Set<string>(await k('memberships as m').join('users as u', 'u.id', 'm.userId').where('m.workspaceId', workspaceId).pluck('u.email'));
  const rows = await k('mail_sink')
    .where((q) => q.where('workspaceSlug', slug).orWhereNull('workspaceSlug'))
    .orderBy('id', 'desc')
    .limit(limit * 4);
  return rows
    .map((r) => ({ id: r.id, fromAddress: r.fromAddress, to: JSON.parse(r.toAddresses) as string[], subject: r.subject, text: r.text, html: r.html, receivedAt: r.receivedAt, ws: r.workspaceSlug }))
    .filter((r) => r.ws === slug || r.to.some((t) => emails.has(t)))
    .slice(0, limit)
    .map(({ ws, ...m }) => (ws === slug ? m : { ...m, text: ACCOUNT_MAIL_WITHHELD, html: '' }));
}

export type QueuedMessage = { id: number; to: string[]; subject: string; status: 'pending' | 'sending' | 'failed'; attempts: number; nextAttemptAt: string; lastError: string | null; createdAt: string };

/**
 * This workspace's mail still in `mail_outbox` and not sent: waiting (or being
 * retried) and given up. Account mail carries no workspace and is not listed.
 * Shown whether mail goes to the local sink or to a real SMTP server.
 */
export async function fetchOutboxQueue(slug: string, limit = 50): Promise<QueuedMessage[]> {
  const rows = await db()('mail_outbox')
    .where({ workspaceSlug: slug })
    .whereIn('status', ['pending', 'sending', 'failed'])
    .orderBy('id', 'desc')
    .limit(limit)
    .select('id', 'toAddresses', 'subject', 'status', 'attempts', 'nextAttemptAt', 'lastError', 'createdAt');
  return rows.map(({ toAddresses, ...r }) => ({ ...r, to: JSON.parse(toAddresses) as string[] }));
}
