import { NextResponse } from 'next/server';
import { createRevision } from '@/lib/approvals/service';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParams, readParams, route } from '@/lib/http';

/** POST: copy an approved or rejected case into a new draft (revisionOf). Analysts and admins. */
export const POST = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  return NextResponse.json(await createRevision(access, readParams(idParams, p).id), { status: 201 });
});
