import 'server-only';
import { randomBytes } from 'node:crypto';
import type { Knex } from 'knex';
import { db } from '../db';

/** The stamps a session's token carries from sign-in. */
export type SessionStamps = { passwordChangedAt?: string | null; sessionStamp?: string | null };

/**
 * Whether a signed-in session still stands: the stamps carried in its token
 * must equal the user's in the database. A reset (or a password set through an
 * invitation) moves `passwordChangedAt`, a sign-out moves `sessionStamp`, so
 * every session signed in before either stops counting. A token from before
 * the stamps existed carries none and still stands while the user has none.
 * One read by primary key.
 */
export async function isSessionCurrent(userId: number, stamps: SessionStamps, k: Knex = db()): Promise<boolean> {
  const user = await k('users').where({ id: userId }).first('passwordChangedAt', 'sessionStamp');
  if (!user) return false;
  return (user.passwordChangedAt ?? null) === (stamps.passwordChangedAt ?? null) && (user.sessionStamp ?? null) === (stamps.sessionStamp ?? null);
}

/**
 * Signs the user out everywhere by moving the session stamp, when the session
 * asking still stands (a stale copy of a cookie cannot sign the user out of the
 * sessions signed in after it).
 */
export async function endSessions(userId: number, stamps: SessionStamps, k: Knex = db()): Promise<boolean> {
  const moved = await k('users')
    .where({ id: userId })
    .andWhere((q) => (stamps.passwordChangedAt ? q.where('passwordChangedAt', stamps.passwordChangedAt) : q.whereNull('passwordChangedAt')))
    .andWhere((q) => (stamps.sessionStamp ? q.where('sessionStamp', stamps.sessionStamp) : q.whereNull('sessionStamp')))
    .update({ sessionStamp: randomBytes(16).toString('base64url') });
  return moved === 1;
}
