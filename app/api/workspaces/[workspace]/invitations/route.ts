import { NextResponse } from 'next/server';
import { createInvitation, fetchPendingInvitations } from '@/lib/accounts/invitations';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { parseOr422, readJson, route } from '@/lib/http';
import { invitationSchema } from '@/lib/validation/approval';

/** GET: invitations not yet used and not expired (admins). */
export const GET = route<{ workspace: string }>(async (_req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.administer);
  return NextResponse.json({ invitations: await fetchPendingInvitations(access.workspace.id) });
});

/** POST: invite an address with a role; the link is mailed (admins). */
export const POST = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.administer);
  const body = parseOr422(invitationSchema, await readJson(req));
  return NextResponse.json(await createInvitation(access, body), { status: 201 });
});
