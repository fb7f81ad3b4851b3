import { NextResponse } from 'next/server';
import { requestPasswordReset } from '@/lib/accounts/password-reset';
import { parseOr422, readJson, route } from '@/lib/http';
import { forgotPasswordSchema } from '@/lib/validation/approval';

/** POST (public): mail a reset link if the address has an account. The answer is the same either way. */
export const POST = route(async (req) => {
  const { email } = parseOr422(forgotPasswordSchema, await readJson(req));
  await requestPasswordReset(email);
  return NextResponse.json({ ok: true, message: 'If an account uses that address, a link to reset its password is on its way.' });
});
