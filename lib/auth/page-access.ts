import 'server-only';
import { headers } from 'next/headers';
import { notFound, redirect } from 'next/navigation';
import { findMembership, type Access } from './access';
import { getSessionUserId } from './session';

/**
 * For server components: the caller's access to a workspace, or a redirect to
 * sign-in (signed out) or the not-found page (not a member). Role checks for a
 * page are made by the page itself, which shows why it is refused.
 */
export async function getPageAccess(slug: string): Promise<Access> {
  const userId = await getSessionUserId();
  if (userId === null) {
    const h = await headers();
    const back = h.get('x-haulcase-path') ?? `/${slug}`;
    redirect(`/sign-in?callbackUrl=${encodeURIComponent(back)}`);
  }
  const access = await findMembership(userId, slug);
  if (!access) notFound();
  return access;
}
