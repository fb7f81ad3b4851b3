import { NextResponse } from 'next/server';
import { fetchCaseApproval } from '@/lib/approvals/queries';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParams, readParams, route } from '@/lib/http';

/** GET: status, history with comments, frozen hash and whether it verifies, and what the caller may do. Every role. */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  return NextResponse.json(await fetchCaseApproval(access, readParams(idParams, p).id));
});
