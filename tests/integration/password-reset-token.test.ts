import { afterAll, beforeAll, beforeEach, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { addMinutes, hashToken, newToken } from '@/lib/accounts/tokens';
import { POST as reset } from '@/app/api/password/reset/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';

// Count the bcrypt hashes a reset makes.
const hashes = vi.hoisted(() => ({ n: 0 }));
vi.mock('@/lib/auth/password', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/lib/auth/password')>();
  return {
    ...real,
    hashPassword: async (plain: string) => {
      hashes.n++;
      return real.hashPassword(plain);
    },
  };
});

const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('password reset with a token on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let userId: number;
  let next = 1;
  /** Each test calls from its own address, so the per-address limit of one does not reach the next. */
  let from: Record<string, string>;
  const attempt = (token: string, headers = from) => call(reset, {}, { body: { token, password: 'a-brand-new-password' }, headers });
  const issue = async (o: { usedAt?: string; expiresAt?: string } = {}) => {
    const token = newToken();
    await k('password_resets').insert({ userId, tokenHash: hashToken(token), expiresAt: o.expiresAt ?? addMinutes(new Date(), 30), usedAt: o.usedAt ?? null, createdAt: new Date().toISOString() });
    return token;
  };

  beforeAll(async () => {
    vi.stubEnv('HAULCASE_TRUSTED_PROXY', '1');
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    userId = (await k('users').where({ email: 'viewer@aldervane.test' }).first('id')).id;
  });
  beforeEach(() => {
    from = { 'x-forwarded-for': `192.0.2.${next++}` };
    hashes.n = 0;
  });
  afterAll(async () => {
    vi.unstubAllEnvs();
    await destroy();
  });

  it('answers 410 to an unknown token without hashing the new password', async () => {
    const r = await attempt(newToken());
    expect(r.status).toBe(410);
    expect(r.body.error).toMatch(/not valid/);
    expect(hashes.n).toBe(0);
  });

  it('answers 410 to a used or an expired token without hashing, and hashes once for a good one', async () => {
    const used = await attempt(await issue({ usedAt: new Date().toISOString() }));
    expect(used.status).toBe(410);
    expect(used.body.error).toMatch(/already been used/);
    const expired = await attempt(await issue({ expiresAt: new Date(Date.now() - 1000).toISOString() }));
    expect(expired.status).toBe(410);
    expect(expired.body.error).toMatch(/expired/);
    expect(hashes.n).toBe(0);
    const ok = await attempt(await issue());
    expect(ok.status).toBe(200);
    expect(ok.body).toEqual({ email: 'viewer@aldervane.test' });
    expect(hashes.n).toBe(1);
  });

  it('answers 429 with Retry-After to the 11th attempt from one address in 15 minutes; other addresses still go through', async () => {
    for (let i = 0; i < 10; i++) expect((await attempt(newToken())).status).toBe(410);
    const refused = await attempt(await issue());
    expect(refused.status).toBe(429);
    expect(Number(refused.response.headers.get('retry-after'))).toBeGreaterThan(800);
    expect(refused.body.error).toMatch(/^Too many password reset attempts from your address \(10 in 15 minutes\)\. Try again in 15 minutes\.$/);
    expect(hashes.n).toBe(0);
    expect((await attempt(newToken(), { 'x-forwarded-for': '198.51.100.200' })).status).toBe(410);
  });
});
