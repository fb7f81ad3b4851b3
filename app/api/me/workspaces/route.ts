import { NextResponse } from 'next/server';
import { listUserWorkspaces } from '@/lib/auth/access';
import { getSessionUserId } from '@/lib/auth/session';
import { route, unauthorized } from '@/lib/http';

/** GET: the signed-in user's workspaces and role in each. */
export const GET = route(async () => {
  const userId = await getSessionUserId();
  if (userId === null) throw unauthorized();
  return NextResponse.json({ workspaces: await listUserWorkspaces(userId) });
});
