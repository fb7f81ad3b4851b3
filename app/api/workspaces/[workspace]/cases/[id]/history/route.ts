import { NextResponse } from 'next/server';
import { fetchCaseApproval } from '@/lib/approvals/queries';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { parseOr422, route } from '@/lib/http';
import { idParam } from '@/lib/validation/approval';

/** GET: status, history with comments, frozen hash and whether it verifies, and what the caller may do. Every role. */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const { workspace, id } = await params;
  const access = await requireMember(workspace, CAN.read);
  return NextResponse.json(await fetchCaseApproval(access, parseOr422(idParam, id)));
});
