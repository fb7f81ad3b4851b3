import 'server-only';
import type { Knex } from 'knex';
import { db } from '../db';

/**
 * Whether a signed-in session still stands: the password-change stamp carried
 * in its token must equal the user's in the database. A reset (or a password
 * set through an invitation) moves the stamp, so every session signed in before
 * it stops counting. A token from before stamps existed carries none and still
 * stands while the user has none. One read by primary key.
 */
export async function isSessionCurrent(userId: number, tokenStamp: string | null | undefined, k: Knex = db()): Promise<boolean> {
  const user = await k('users').where({ id: userId }).first('passwordChangedAt');
  if (!user) return false;
  return (user.passwordChangedAt ?? null) === (tokenStamp ?? null);
}
