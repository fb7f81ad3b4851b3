import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { fetchCaseFormOptions } from '@/lib/db/queries/cases';
import { route } from '@/lib/http';

/** GET: what a case can be built from — assumption sets, trucks (with their own offer) and offers. */
export const GET = route<{ workspace: string }>(async (_req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  return NextResponse.json(await fetchCaseFormOptions(access.workspace.id));
});
