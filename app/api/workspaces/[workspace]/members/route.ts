import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { fetchMembers } from '@/lib/db/queries/workspace';
import { route } from '@/lib/http';

/** GET: the workspace's members and roles (admins only). */
export const GET = route<{ workspace: string }>(async (_req, { params }) => {
  const { workspace } = await params;
  const access = await requireMember(workspace, CAN.administer);
  return NextResponse.json({ members: await fetchMembers(access.workspace.id) });
});
