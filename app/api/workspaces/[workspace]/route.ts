import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { fetchWorkspaceCounts } from '@/lib/db/queries/workspace';
import { route } from '@/lib/http';

/** GET: the workspace as its member sees it: name, currency, settings, the caller's role and counts. */
export const GET = route<{ workspace: string }>(async (_req, { params }) => {
  const { workspace } = await params;
  const access = await requireMember(workspace);
  return NextResponse.json({ workspace: access.workspace, role: access.role, counts: await fetchWorkspaceCounts(access.workspace.id) });
});
