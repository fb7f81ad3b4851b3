/**
 * The pages' Content-Security-Policy (set by proxy.ts), with a fresh nonce per request: Next puts
 * the nonce on its own scripts when it finds this header on the request (so
 * every page renders dynamically: `dynamic = 'force-dynamic'` in app/layout.tsx),
 * and 'strict-dynamic' lets those scripts load the chunks. No 'unsafe-inline'
 * for scripts; styles keep it (Next and the fonts inject small style tags).
 * The dev server also needs eval for refresh.
 */
export function contentSecurityPolicy(nonce: string, dev = process.env.NODE_ENV !== 'production'): string {
  return [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${dev ? " 'unsafe-eval'" : ''}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    "frame-ancestors 'none'",
  ].join('; ');
}

export function makeNonce(): string {
  const bytes = crypto.getRandomValues(new Uint8Array(16));
  return btoa(String.fromCharCode(...bytes));
}
