import { describe, expect, it } from 'vitest';
import { FALLBACK_BASE, mailBaseUrl, mailBaseWarning, warnMailBaseOnce, withRequestOrigin } from '@/lib/mail/base-url';

describe('mail base URL', () => {
  it('uses APP_URL first, without a trailing slash, even inside a request', () => {
    const raw = { APP_URL: 'https://mine.example.com/' };
    expect(withRequestOrigin('http://127.0.0.1:4123', () => mailBaseUrl(raw))).toBe('https://mine.example.com');
    expect(mailBaseWarning(raw)).toBeNull();
  });

  it('outside a request without APP_URL: NEXTAUTH_URL, still with a warning naming it', () => {
    const raw = { NEXTAUTH_URL: 'http://plant.example.com:8080' };
    expect(mailBaseUrl(raw)).toBe('http://plant.example.com:8080');
    expect(withRequestOrigin('http://127.0.0.1:4123', () => mailBaseUrl(raw))).toBe('http://127.0.0.1:4123');
    expect(mailBaseWarning(raw)).toMatch(/background task links to http:\/\/plant\.example\.com:8080/);
  });

  it('uses the request origin when nothing is configured', async () => {
    const got = await withRequestOrigin('http://127.0.0.1:4123', async () => {
      await new Promise((r) => setTimeout(r, 0));
      return mailBaseUrl({});
    });
    expect(got).toBe('http://127.0.0.1:4123');
  });

  it('outside a request with nothing configured: the fallback, and a warning, logged once', () => {
    expect(mailBaseUrl({})).toBe(FALLBACK_BASE);
    expect(mailBaseWarning({})).toMatch(/^APP_URL is not set/);
    const logged: string[] = [];
    const saved = { APP_URL: process.env.APP_URL };
    delete process.env.APP_URL;
    try {
      warnMailBaseOnce((m) => logged.push(m));
      warnMailBaseOnce((m) => logged.push(m));
    } finally {
      if (saved.APP_URL !== undefined) process.env.APP_URL = saved.APP_URL;
    }
    expect(logged).toHaveLength(1);
    expect(logged[0]).toMatch(/APP_URL is not set/);
  });
});
