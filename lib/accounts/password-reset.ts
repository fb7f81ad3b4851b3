import 'server-only';
import { after } from 'next/server';
import { hashPassword } from '@/lib/auth/password';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { HttpError } from '@/lib/http';
import { readMailConfig } from '@/lib/mail/config';
import { passwordResetMail } from '@/lib/mail/messages';
import { enqueueMail, mailCommitted } from '@/lib/mail/queue';
import { nowIso } from '@/lib/time';
import { addMinutes, assertUsable, hashToken, newToken, RESET_MINUTES } from './tokens';

/**
 * Mails a reset link when the address has an account, and does nothing
 * otherwise; the caller answers the same either way so addresses can't be probed.
 * Request handlers call `requestPasswordResetAfterResponse` instead, so the
 * answer does not wait for this work either.
 */
export async function requestPasswordReset(email: string): Promise<void> {
  const k = db();
  const user = await k('users').where({ email }).first('id', 'email');
  if (!user) return;
  const token = newToken();
  await k.transaction(async (trx) => {
    await trx('password_resets').insert({ userId: user.id, tokenHash: hashToken(token), expiresAt: addMinutes(new Date(), RESET_MINUTES), createdAt: nowIso() });
    await writeAudit(trx, { workspaceId: null, userId: user.id, action: 'request-reset', entity: 'user', entityId: user.id });
    await enqueueMail(trx, { ...passwordResetMail({ link: `${readMailConfig().appUrl}/reset-password/${token}`, minutes: RESET_MINUTES }), to: [user.email] });
  });
  await mailCommitted();
}

/**
 * Sets the new password and spends the token (and any other open token of the
 * account). The token is looked up first: an unknown, used or expired one
 * answers 410 without the new password being hashed, so made-up tokens cost
 * no bcrypt work; it is checked again in the transaction that spends it.
 */
export async function resetPassword(token: string, password: string): Promise<{ email: string }> {
  const tokenHash = hashToken(token);
  assertUsable(await db()('password_resets').where({ tokenHash }).first(), 'password reset', new Date(), 410);
  const passwordHash = await hashPassword(password);
  return db().transaction(async (trx) => {
    const row = await trx('password_resets').where({ tokenHash }).first();
    assertUsable(row, 'password reset', new Date(), 410);
    const at = nowIso();
    const used = await trx('password_resets').where({ userId: row.userId }).whereNull('usedAt').update({ usedAt: at });
    if (used < 1) throw new HttpError(410, 'This password reset link has already been used. Links work once.');
    // moving the stamp ends every session signed in with the old password
    await trx('users').where({ id: row.userId }).update({ passwordHash, passwordChangedAt: at, updatedAt: at });
    await writeAudit(trx, { workspaceId: null, userId: row.userId, action: 'reset-password', entity: 'user', entityId: row.userId });
    const user = await trx('users').where({ id: row.userId }).first('email');
    return { email: user.email as string };
  });
}

const pending = new Set<Promise<void>>();

/**
 * Runs `requestPasswordReset` after the response has been sent (Next's
 * `after()`; outside a request, on the next turn of the event loop), so the
 * "forgot password" answer does the same work, and takes the same time,
 * whether or not the address has an account: no lookup, token, audit row or
 * outbox row on the request path, and no SMTP. The token and its mail are still
 * written in one transaction; a process that dies before it runs sends nothing
 * (the person asks again). Errors are logged.
 */
export function requestPasswordResetAfterResponse(email: string): void {
  let start!: () => void;
  const run: Promise<void> = new Promise<void>((resolve) => (start = resolve))
    .then(() => requestPasswordReset(email))
    .catch((err) => console.error('[haulcase] a password reset request failed after its answer:', err))
    .finally(() => pending.delete(run));
  pending.add(run);
  try {
    after(() => {
      start();
      return run;
    });
  } catch {
    setImmediate(start); // no request scope (a handler called directly, a script)
  }
}

/** Tests: waits until every reset request started after a response has finished. */
export async function settlePasswordResetRequests(): Promise<void> {
  while (pending.size) await Promise.all([...pending]);
}
