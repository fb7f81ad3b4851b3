import { NextResponse } from 'next/server';
import { requestPasswordResetAfterResponse } from '@/lib/accounts/password-reset';
import { admitResetRequest } from '@/lib/auth/reset-throttle';
import { clientAddress } from '@/lib/auth/throttle';
import { db } from '@/lib/db';
import { BODY_LIMITS, parseOr422, readJson, route } from '@/lib/http';
import { forgotPasswordSchema } from '@/lib/validation/approval';

/**
 * POST (public): mail a reset link if the address has an account. The answer is
 * the same either way; too many requests for one e-mail or from one address
 * answer 429 (also the same either way) and mail nothing. The request path
 * does the same work for a known and an unknown address (the throttle row);
 * the reset itself runs after the answer.
 */
export const POST = route(async (req) => {
  const { email } = parseOr422(forgotPasswordSchema, await readJson(req));
  const state = await admitResetRequest(db(), email, clientAddress(req.headers));
  if (!state.allowed) {
    const minutes = Math.ceil(state.retryAfterSeconds / 60);
    return NextResponse.json(
      { error: `Too many reset requests for this email or from your network. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}; a link already sent stays valid for an hour.` },
      { status: 429, headers: { 'Retry-After': String(state.retryAfterSeconds) } },
    );
  }
  // the account lookup, token and mail happen after this answer, so it looks and lasts the same for any address
  requestPasswordResetAfterResponse(email);
  return NextResponse.json({ ok: true, message: 'If an account uses that address, a link to reset its password is on its way.' });
}, { limit: BODY_LIMITS.auth });
