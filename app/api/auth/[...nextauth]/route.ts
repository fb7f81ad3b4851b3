import NextAuth from 'next-auth';
import { NextResponse } from 'next/server';
import { authOptions } from '@/lib/auth/options';
import { checkSignInThrottle, clientAddress } from '@/lib/auth/throttle';
import { db } from '@/lib/db';

const handler = NextAuth(authOptions);

type Ctx = { params: Promise<{ nextauth: string[] }> };

/** Sign-in attempts are refused with 429 while that account and address are throttled. */
async function post(request: Request, ctx: Ctx) {
  const { nextauth } = await ctx.params;
  if (nextauth.join('/') === 'callback/credentials') {
    const form = await request.clone().formData().catch(() => null);
    const email = String(form?.get('email') ?? '').trim().toLowerCase();
    if (email) {
      const state = await checkSignInThrottle(db(), email, clientAddress(request.headers));
      if (state.locked) {
        const minutes = Math.ceil(state.retryAfterSeconds / 60);
        return NextResponse.json(
          {
            url: new URL('/sign-in?error=Throttled', request.url).toString(),
            error: `Too many failed sign-ins for this account from your address. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
          },
          { status: 429, headers: { 'Retry-After': String(state.retryAfterSeconds) } },
        );
      }
    }
  }
  return handler(request, ctx);
}

export { handler as GET, post as POST };
