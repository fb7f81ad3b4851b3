import { NextResponse } from 'next/server';
import { resetPassword } from '@/lib/accounts/password-reset';
import { admitResetToken, clientAddress, RESET_TOKEN_THROTTLE, waitText } from '@/lib/auth/throttle';
import { db } from '@/lib/db';
import { BODY_LIMITS, parseOr422, readJson, route } from '@/lib/http';
import { resetPasswordSchema } from '@/lib/validation/approval';

/**
 * POST (public: the token is the credential): set a new password with a
 * single-use, expiring token. An unknown, used or expired token answers 410;
 * one address may try RESET_TOKEN_THROTTLE.perAddress times in 15 minutes,
 * then 429 with Retry-After.
 */
export const POST = route(async (req) => {
  const { token, password } = parseOr422(resetPasswordSchema, await readJson(req));
  const state = await admitResetToken(db(), clientAddress(req.headers));
  if (!state.allowed) {
    return NextResponse.json(
      { error: `Too many password reset attempts from your address (${RESET_TOKEN_THROTTLE.perAddress} in ${RESET_TOKEN_THROTTLE.windowMinutes} minutes). Try again in ${waitText(state.retryAfterSeconds)}.` },
      { status: 429, headers: { 'Retry-After': String(state.retryAfterSeconds) } },
    );
  }
  return NextResponse.json(await resetPassword(token, password));
}, { limit: BODY_LIMITS.auth });
