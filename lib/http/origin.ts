/**
 * Same-origin rule for the app's own API (not next-auth's routes, which keep
 * their CSRF token): a state-changing request (any method but GET, HEAD,
 * OPTIONS) must
 *  - come from the app's own origin: `Origin` equal to it, or, when a browser
 *    sends no Origin, `Sec-Fetch-Site: same-origin`; otherwise 403;
 *  - carry `Content-Type: application/json` (`multipart/form-data` on the
 *    upload routes); otherwise 415.
 * A page on another port of the same host is same-site but not same-origin, so
 * its forms (text/plain, urlencoded) and no-cors fetches are refused before any
 * handler runs. A browser cannot send a JSON content type cross-origin without a
 * CORS preflight, which this app never answers.
 */

export const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

type Env = Record<string, string | undefined>;

function originOf(url: string | undefined): string | null {
  if (!url) return null;
  try {
    return new URL(url).origin;
  } catch {
    return null;
  }
}

const firstValue = (v: string | null) => (v ?? '').split(',')[0].trim();

/**
 * The origins the app answers on: those of APP_URL and NEXTAUTH_URL (as the
 * mail links and next-auth use them); when neither is set, the one the request
 * was made to (Host, or X-Forwarded-Host/-Proto behind HAULCASE_TRUSTED_PROXY=1).
 */
export function appOrigins(request: Request, env: Env = process.env): string[] {
  const configured = [originOf(env.APP_URL), originOf(env.NEXTAUTH_URL)].filter((o): o is string => !!o);
  if (configured.length) return [...new Set(configured)];
  const url = new URL(request.url);
  const trusted = env.HAULCASE_TRUSTED_PROXY === '1';
  const host = (trusted && firstValue(request.headers.get('x-forwarded-host'))) || request.headers.get('host') || url.host;
  const proto = (trusted && firstValue(request.headers.get('x-forwarded-proto'))) || url.protocol.replace(/:$/, '');
  return [`${proto}://${host}`.toLowerCase()];
}

export class RequestRefused extends Error {
  constructor(
    readonly status: 403 | 415,
    message: string,
  ) {
    super(message);
  }
}

/** Throws 403 unless the request comes from the app's own origin (see above). */
export function checkSameOrigin(request: Request, env: Env = process.env): void {
  const origin = request.headers.get('origin');
  const own = appOrigins(request, env);
  if (origin === null) {
    if (request.headers.get('sec-fetch-site') === 'same-origin') return;
    throw new RequestRefused(403, `Refused: a request that changes data must come from this app (${own[0]}) and say so in its Origin header.`);
  }
  if (!own.includes(origin.toLowerCase())) {
    throw new RequestRefused(403, `Refused: this request came from ${origin}, not from this app (${own[0]}).`);
  }
}

export type BodyKind = 'json' | 'multipart';
const MEDIA = { json: 'application/json', multipart: 'multipart/form-data' } as const;

/** Throws 415 unless the request's media type is the one the route takes. */
export function checkContentType(request: Request, kind: BodyKind): void {
  const media = (request.headers.get('content-type') ?? '').split(';')[0].trim().toLowerCase();
  if (media !== MEDIA[kind]) {
    throw new RequestRefused(415, `Send this request with Content-Type: ${MEDIA[kind]}${media ? ` (it came as ${media})` : ''}.`);
  }
}

/** Served over https: the request URL, the configured app URL, or X-Forwarded-Proto behind a trusted proxy. */
export function isHttps(request: Request, env: Env = process.env): boolean {
  if (new URL(request.url).protocol === 'https:') return true;
  if ((env.APP_URL || env.NEXTAUTH_URL || '').startsWith('https://')) return true;
  return env.HAULCASE_TRUSTED_PROXY === '1' && firstValue(request.headers.get('x-forwarded-proto')).toLowerCase() === 'https';
}

export const HSTS = 'max-age=31536000; includeSubDomains';
