import { NextResponse } from 'next/server';
import { createRevision } from '@/lib/approvals/service';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { parseOr422, route } from '@/lib/http';
import { idParam } from '@/lib/validation/approval';

/** POST: copy an approved or rejected case into a new draft (revisionOf). Analysts and admins. */
export const POST = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const { workspace, id } = await params;
  const access = await requireMember(workspace, CAN.edit);
  return NextResponse.json(await createRevision(access, parseOr422(idParam, id)), { status: 201 });
});
