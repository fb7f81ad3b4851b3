import NextAuth from 'next-auth';
import { NextRequest, NextResponse } from 'next/server';
import { authOptions } from '@/lib/auth/options';
import { clientAddress, peekSignIn, waitText } from '@/lib/auth/throttle';
import { db } from '@/lib/db';
import { BODY_LIMITS, errorResponse, withApiHeaders } from '@/lib/http';
import { readBytes } from '@/lib/http/body';

const handler = NextAuth(authOptions);

type Ctx = { params: Promise<{ nextauth: string[] }> };

/**
 * next-auth's POSTs (sign-in callback, sign-out, …) keep next-auth's own CSRF
 * token; their bodies are read here first, at most BODY_LIMITS.auth (413 on a
 * larger Content-Length or stream), and next-auth reads that copy.
 */
async function post(incoming: NextRequest, ctx: Ctx) {
  let request: NextRequest;
  try {
    const bytes = await readBytes(incoming, BODY_LIMITS.auth);
    request = new NextRequest(incoming.url, { method: 'POST', headers: incoming.headers, body: bytes.byteLength ? bytes : undefined });
  } catch (err) {
    return withApiHeaders(errorResponse(err), incoming);
  }
  return throttled(request, ctx);
}

/**
 * Sign-in attempts that must wait (lib/auth/throttle.ts) are refused with 429
 * and Retry-After before next-auth runs; the count itself is taken in
 * `authorize`, atomically, before the password is checked.
 */
async function throttled(request: NextRequest, ctx: Ctx) {
  const { nextauth } = await ctx.params;
  if (nextauth.join('/') === 'callback/credentials') {
    const form = await request.clone().formData().catch(() => null);
    const email = String(form?.get('email') ?? '').trim().toLowerCase();
    if (email) {
      const state = await peekSignIn(db(), email, clientAddress(request.headers));
      if (!state.allowed) {
        return NextResponse.json(
          {
            url: new URL('/sign-in?error=Throttled', request.url).toString(),
            error: `Too many failed sign-ins for this account or from your address. Try again in ${waitText(state.retryAfterSeconds)}.`,
          },
          { status: 429, headers: { 'Retry-After': String(state.retryAfterSeconds) } },
        );
      }
    }
  }
  return handler(request, ctx);
}

export { handler as GET, post as POST };
