import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { admitResetRequest, RESET_THROTTLE } from '@/lib/auth/reset-throttle';
import { POST as forgot } from '@/app/api/password/forgot/route';
import { settlePasswordResetRequests } from '@/lib/accounts/password-reset';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

// the reset and its mail are written after the answer: wait for them, as the mail checks below read the sink
const ask = async (email: string, from: string) => {
  const r = await call(forgot, {}, { body: { email }, headers: { 'x-forwarded-for': from } });
  await settlePasswordResetRequests();
  return r;
};

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('forgot-password throttle on $name', ({ pg }) => {
  let k: Knex;
  let close: () => Promise<void>;

  beforeAll(async () => {
    // these requests reach the app through a proxy that sets X-Forwarded-For
    vi.stubEnv('HAULCASE_TRUSTED_PROXY', '1');
    ({ k, close } = await openMailDb(pg));
    signInAs(null);
  });
  afterAll(async () => {
    vi.unstubAllEnvs();
    await close();
  });

  it('answers 429 after three requests for one e-mail, the same for a known and an unknown address, mailing nothing more', async () => {
    await k('mail_sink').del();
    for (let i = 0; i < RESET_THROTTLE.perEmail; i++) {
      expect((await ask('analyst@aldervane.test', `10.0.0.${i + 1}`)).status).toBe(200);
      expect((await ask('nobody@aldervane.test', `10.0.1.${i + 1}`)).status).toBe(200);
    }
    const resetsBefore = (await k('password_resets')).length;
    // a new address does not help: the limit is per e-mail
    const known = await ask('Analyst@Aldervane.test', '10.0.9.9');
    const unknown = await ask('nobody@aldervane.test', '10.0.9.8');
    expect(known.status).toBe(429);
    expect(unknown.status).toBe(429);
    expect(known.body.error).toMatch(/^Too many reset requests for this email or from your network\. Try again in 15 minutes/);
    expect(unknown.body).toEqual(known.body);
    expect(Number(known.response.headers.get('retry-after'))).toBeGreaterThan(800);
    expect((await k('password_resets')).length).toBe(resetsBefore);
    expect(await k('mail_sink')).toHaveLength(RESET_THROTTLE.perEmail);
  });

  it('answers 429 to one address after ten requests for different e-mails; other addresses still go through', async () => {
    for (let i = 0; i < RESET_THROTTLE.perAddress; i++) {
      expect((await ask(`person${i}@example.test`, '192.0.2.7')).status).toBe(200);
    }
    const refused = await ask('someone-else@example.test', '192.0.2.7');
    expect(refused.status).toBe(429);
    expect(refused.body.error).toMatch(/Try again in \d+ minutes?/);
    expect((await ask('someone-else@example.test', '192.0.2.8')).status).toBe(200);
  });

  it('refused requests are not recorded, so the window clears on time', async () => {
    const t0 = new Date('2026-06-01T10:00:00Z');
    const at = (min: number) => new Date(t0.getTime() + min * 60_000);
    for (let i = 0; i < RESET_THROTTLE.perEmail; i++) expect(await admitResetRequest(k, 'window@example.test', `198.51.100.${i}`, at(i))).toEqual({ allowed: true });
    const refused = await admitResetRequest(k, 'window@example.test', '198.51.100.50', at(10));
    expect(refused).toEqual({ allowed: false, retryAfterSeconds: 5 * 60 });
    expect(await admitResetRequest(k, 'window@example.test', '198.51.100.50', at(14))).toMatchObject({ allowed: false });
    // 15 minutes after the first request it has left the window
    expect(await admitResetRequest(k, 'window@example.test', '198.51.100.50', at(15.01))).toEqual({ allowed: true });
    expect(await k('password_reset_requests').where({ email: 'window@example.test' })).toHaveLength(RESET_THROTTLE.perEmail + 1);
  });

  it('still refuses a malformed e-mail with 422 before counting it', async () => {
    const r = await ask('not an email', '203.0.113.1');
    expect(r.status).toBe(422);
    expect(r.body.problems[0]).toMatchObject({ path: 'email', message: 'Enter a valid email address.' });
    expect(await k('password_reset_requests').where({ address: '203.0.113.1' })).toHaveLength(0);
  });
});
