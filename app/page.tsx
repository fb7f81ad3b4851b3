import { redirect } from 'next/navigation';
import { getSessionUserId } from '@/lib/auth/session';
import { listUserWorkspaces } from '@/lib/auth/access';

export const dynamic = 'force-dynamic';

/** Home: the first workspace of the signed-in user, or sign-in. */
export default async function Home() {
  const userId = await getSessionUserId();
  if (userId === null) redirect('/sign-in');
  const workspaces = await listUserWorkspaces(userId);
  if (!workspaces.length) redirect('/sign-in?error=NoWorkspace');
  redirect(`/${workspaces[0].slug}`);
}
