import { NextResponse } from 'next/server';
import { acceptInvitation } from '@/lib/accounts/invitations';
import { getSessionUserId } from '@/lib/auth/session';
import { BODY_LIMITS, parseOr422, readJson, route } from '@/lib/http';
import { acceptInvitationSchema } from '@/lib/validation/approval';

/** POST (public: the token is the credential): accept an invitation, creating the account or joining with the signed-in one. */
export const POST = route(async (req) => {
  const body = parseOr422(acceptInvitationSchema, await readJson(req));
  return NextResponse.json(await acceptInvitation(body, await getSessionUserId()));
}, { limit: BODY_LIMITS.auth });
