import { NextResponse, type NextRequest } from 'next/server';
import { getToken } from 'next-auth/jwt';
import { authSecret } from '@/lib/auth/secret';

// Pages anyone may open; everything else needs a session. The proxy only redirects:
// every route handler and page still checks the session and role on the server.
const PUBLIC = [/^\/sign-in/, /^\/invite\//, /^\/reset-password/, /^\/forgot-password/];

export async function proxy(request: NextRequest) {
  const { pathname, search } = request.nextUrl;
  const headers = new Headers(request.headers);
  headers.set('x-haulcase-path', pathname + search);
  if (!PUBLIC.some((re) => re.test(pathname))) {
    const token = await getToken({ req: request, secret: authSecret() });
    if (!token) {
      const url = request.nextUrl.clone();
      url.pathname = '/sign-in';
      url.search = `?callbackUrl=${encodeURIComponent(pathname + search)}`;
      return NextResponse.redirect(url);
    }
  }
  return NextResponse.next({ request: { headers } });
}

export const config = {
  matcher: ['/((?!api/|_next/|favicon.ico|fonts/).*)'],
};
