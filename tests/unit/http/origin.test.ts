import { describe, expect, it } from 'vitest';
import { appOrigins, checkContentType, checkSameOrigin, isHttps } from '@/lib/http/origin';
import { contentSecurityPolicy, makeNonce } from '@/lib/http/csp';

const req = (url: string, headers: Record<string, string> = {}) => new Request(url, { method: 'POST', headers });

describe('the app origin and the same-origin rule', () => {
  it('takes the origin of APP_URL or NEXTAUTH_URL when set, else the request host', () => {
    expect(appOrigins(req('http://10.0.0.5:3000/api/x'), { APP_URL: 'https://haulcase.example/base/' })).toEqual(['https://haulcase.example']);
    expect(appOrigins(req('http://10.0.0.5:3000/api/x'), { NEXTAUTH_URL: 'http://127.0.0.1:3000' })).toEqual(['http://127.0.0.1:3000']);
    expect(appOrigins(req('http://10.0.0.5:3000/api/x', { host: 'mine.example:8080' }), {})).toEqual(['http://mine.example:8080']);
    expect(appOrigins(req('http://10.0.0.5:3000/api/x'), {})).toEqual(['http://10.0.0.5:3000']);
  });

  it('reads X-Forwarded-Host and -Proto only behind HAULCASE_TRUSTED_PROXY=1', () => {
    const r = req('http://app:3000/api/x', { host: 'app:3000', 'x-forwarded-host': 'haulcase.example', 'x-forwarded-proto': 'https' });
    expect(appOrigins(r, {})).toEqual(['http://app:3000']);
    expect(appOrigins(r, { HAULCASE_TRUSTED_PROXY: '1' })).toEqual(['https://haulcase.example']);
  });

  it('accepts the own origin, or no Origin with Sec-Fetch-Site: same-origin; refuses the rest with 403', () => {
    const env = { APP_URL: 'http://127.0.0.1:3000' };
    expect(() => checkSameOrigin(req('http://127.0.0.1:3000/api/x', { origin: 'http://127.0.0.1:3000' }), env)).not.toThrow();
    expect(() => checkSameOrigin(req('http://127.0.0.1:3000/api/x', { 'sec-fetch-site': 'same-origin' }), env)).not.toThrow();
    const refused: Array<Record<string, string>> = [{ origin: 'http://127.0.0.1:4000' }, { origin: 'null' }, { 'sec-fetch-site': 'same-site' }, {}];
    for (const headers of refused) {
      expect(() => checkSameOrigin(req('http://127.0.0.1:3000/api/x', headers), env), JSON.stringify(headers)).toThrow(expect.objectContaining({ status: 403 }));
    }
  });

  it('wants the route media type, parameters allowed (415 otherwise)', () => {
    expect(() => checkContentType(req('http://x/', { 'content-type': 'application/json; charset=utf-8' }), 'json')).not.toThrow();
    expect(() => checkContentType(req('http://x/', { 'content-type': 'multipart/form-data; boundary=a' }), 'multipart')).not.toThrow();
    for (const ct of ['text/plain', 'application/x-www-form-urlencoded', 'multipart/form-data; boundary=a', '']) {
      expect(() => checkContentType(req('http://x/', ct ? { 'content-type': ct } : {}), 'json'), ct).toThrow(expect.objectContaining({ status: 415 }));
    }
  });

  it('is https by the URL, an https app URL, or X-Forwarded-Proto behind a trusted proxy', () => {
    expect(isHttps(req('https://x/'), {})).toBe(true);
    expect(isHttps(req('http://x/'), { NEXTAUTH_URL: 'https://x' })).toBe(true);
    expect(isHttps(req('http://x/', { 'x-forwarded-proto': 'https' }), {})).toBe(false);
    expect(isHttps(req('http://x/', { 'x-forwarded-proto': 'https' }), { HAULCASE_TRUSTED_PROXY: '1' })).toBe(true);
    expect(isHttps(req('http://x/'), {})).toBe(false);
  });
});

describe('the pages CSP', () => {
  it('allows scripts by a fresh nonce only (no unsafe-inline; eval only for the dev server)', () => {
    const a = makeNonce();
    expect(a).toMatch(/^[A-Za-z0-9+/]{22}==$/);
    expect(makeNonce()).not.toBe(a);
    const prod = contentSecurityPolicy(a, false);
    expect(prod).toContain(`script-src 'self' 'nonce-${a}' 'strict-dynamic';`);
    expect(prod).not.toMatch(/script-src[^;]*unsafe-(inline|eval)/);
    expect(contentSecurityPolicy(a, true)).toMatch(/script-src[^;]*'unsafe-eval'/);
    expect(prod).toContain("frame-ancestors 'none'");
  });
});
