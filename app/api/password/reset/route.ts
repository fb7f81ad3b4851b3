import { NextResponse } from 'next/server';
import { resetPassword } from '@/lib/accounts/password-reset';
import { BODY_LIMITS, parseOr422, readJson, route } from '@/lib/http';
import { resetPasswordSchema } from '@/lib/validation/approval';

/** POST (public: the token is the credential): set a new password with a single-use, expiring token. */
export const POST = route(async (req) => {
  const { token, password } = parseOr422(resetPasswordSchema, await readJson(req));
  return NextResponse.json(await resetPassword(token, password));
}, { limit: BODY_LIMITS.auth });
