import 'server-only';
import { getServerSession } from 'next-auth';
import { authOptions } from './options';

/** The signed-in user's id from the JWT session, or null. Integration tests replace this module. */
export async function getSessionUserId(): Promise<number | null> {
  const session = await getServerSession(authOptions);
  const id = session?.user?.id;
  return typeof id === 'number' && Number.isInteger(id) ? id : null;
}
