import 'server-only';
import { getServerSession } from 'next-auth';
import { authOptions } from './options';
import { isSessionCurrent } from './session-current';

/**
 * The signed-in user's id from the JWT session, or null — also null when the
 * password was reset, or the user signed out, after this session signed in.
 * Integration tests replace this module.
 */
export async function getSessionUserId(): Promise<number | null> {
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  if (typeof id !== 'number' || !Number.isInteger(id)) return null;
  const current = await isSessionCurrent(id, { passwordChangedAt: session?.user?.passwordChangedAt, sessionStamp: session?.user?.sessionStamp });
  return current ? id : null;
}
