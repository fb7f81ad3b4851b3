import { NextResponse, type NextRequest } from 'next/server';
import { getToken } from 'next-auth/jwt';
import { authSecret } from '@/lib/auth/secret';
import { contentSecurityPolicy, makeNonce } from '@/lib/http/csp';
import { HSTS, isHttps } from '@/lib/http/origin';
import { hasBrokenPercentEncoding } from '@/lib/url-path';

// Pages anyone may open; everything else needs a session. The proxy only redirects:
// every route handler and page still checks the session and role on the server.
const PUBLIC = [/^\/sign-in/, /^\/invite\//, /^\/reset-password/, /^\/forgot-password/];

function secured(response: NextResponse, request: NextRequest, csp?: string): NextResponse {
  if (csp) response.headers.set('Content-Security-Policy', csp);
  if (isHttps(request)) response.headers.set('Strict-Transport-Security', HSTS);
  return response;
}

export async function proxy(request: NextRequest) {
  const { pathname, search } = request.nextUrl;
  if (hasBrokenPercentEncoding(pathname)) {
    return pathname.startsWith('/api/') ? NextResponse.json({ error: 'Not found.' }, { status: 404 }) : new NextResponse('Not found', { status: 404 });
  }
  // the API route passes the proxy only for the check above; it checks the session itself
  if (pathname.startsWith('/api/')) return NextResponse.next();
  const nonce = makeNonce();
  const csp = contentSecurityPolicy(nonce);
  const headers = new Headers(request.headers);
  headers.set('x-haulcase-path', pathname + search);
  headers.set('x-nonce', nonce);
  headers.set('Content-Security-Policy', csp);
  if (!PUBLIC.some((re) => re.test(pathname))) {
    const token = await getToken({ req: request, secret: authSecret() });
    if (!token) {
      const url = request.nextUrl.clone();
      url.pathname = '/sign-in';
      url.search = `?callbackUrl=${encodeURIComponent(pathname + search)}`;
      return secured(NextResponse.redirect(url), request);
    }
  }
  return secured(NextResponse.next({ request: { headers } }), request, csp);
}

export const config = {
  // every page; of the API only the truck route (GET only), whose segment is a unit number anyone may type:
  // a proxy on a route with a body would buffer it (uploads, imports)
  matcher: ['/((?!api/|_next/|favicon.ico|fonts/).*)', '/api/workspaces/:workspace/cases/:id/trucks/:truckId'],
};
