import { afterAll, afterEach, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { DEMO_PASSWORD } from '@/db/seeds/demo';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';

// Every bcrypt comparison sign-in makes goes through verifyPassword: count them.
const compares = vi.hoisted(() => ({ n: 0 }));
vi.mock('@/lib/auth/password', async (importOriginal) => {
  const real = await importOriginal<typeof import('@/lib/auth/password')>();
  return {
    ...real,
    verifyPassword: async (plain: string, hash: string) => {
      compares.n++;
      return real.verifyPassword(plain, hash);
    },
  };
});

type Authorize = (credentials: Record<string, string>, req: { headers: Record<string, string> }) => Promise<unknown>;
type Outcome = 'ok' | 'wrong' | 'throttled';

const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

describe.each(backends)('sign-in throttle on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let authorize: Authorize;
  let demoHash: string;

  /** One sign-in through next-auth's credentials authorize, as the callback route calls it. */
  const signIn = async (email: string, password: string, headers: Record<string, string> = {}): Promise<Outcome> => {
    try {
      return (await authorize({ email, password }, { headers })) ? 'ok' : 'wrong';
    } catch (err) {
      if ((err as Error).message === 'Throttled') return 'throttled';
      throw err;
    }
  };
  const tally = (outcomes: Outcome[]) => ({
    ok: outcomes.filter((o) => o === 'ok').length,
    wrong: outcomes.filter((o) => o === 'wrong').length,
    throttled: outcomes.filter((o) => o === 'throttled').length,
  });
  /** A fresh account with the demo password, so each test starts with no counters. */
  const account = async (email: string) => {
    const now = new Date().toISOString();
    await k('users').insert({ email, name: email, passwordHash: demoHash, createdAt: now, updatedAt: now });
    return email;
  };

  beforeAll(async () => {
    process.env.NEXTAUTH_SECRET ??= 'integration-test-secret';
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    demoHash = (await k('users').where({ email: 'admin@aldervane.test' }).first('passwordHash')).passwordHash;
    const { authOptions } = await import('@/lib/auth/options');
    authorize = (authOptions.providers[0] as unknown as { options: { authorize: Authorize } }).options.authorize;
  });
  afterEach(() => {
    vi.useRealTimers();
    vi.unstubAllEnvs();
  });
  afterAll(async () => destroy());

  it('counts 100 concurrent wrong passwords before checking them: only the first 5 reach bcrypt, and a correct password in a burst after them is refused', async () => {
    const email = await account(`burst-${pg}@example.test`);
    compares.n = 0;
    const first = tally(await Promise.all(Array.from({ length: 100 }, (_, i) => signIn(email, `wrong-${i}`))));
    expect(compares.n).toBe(5);
    expect(first).toEqual({ ok: 0, wrong: 5, throttled: 95 });
    const burst = Array.from({ length: 40 }, (_, i) => (i === 20 ? DEMO_PASSWORD : `wrong-again-${i}`));
    const second = tally(await Promise.all(burst.map((p) => signIn(email, p))));
    expect(second).toEqual({ ok: 0, wrong: 0, throttled: 40 });
    expect(compares.n).toBe(5);
  });

  it('checks at most 5 passwords of a fresh burst of 40 holding the correct one', async () => {
    const email = await account(`burst40-${pg}@example.test`);
    compares.n = 0;
    const burst = Array.from({ length: 40 }, (_, i) => (i === 39 ? DEMO_PASSWORD : `wrong-${i}`));
    const outcomes = tally(await Promise.all(burst.map((p) => signIn(email, p))));
    expect(compares.n).toBeLessThanOrEqual(5);
    expect(outcomes.ok + outcomes.wrong).toBe(compares.n);
    expect(outcomes.throttled).toBeGreaterThanOrEqual(35);
  });

  it('compares an unknown address against a dummy hash once, as it does a wrong password', async () => {
    compares.n = 0;
    expect(await signIn(`nobody-${pg}@example.test`, 'some-password')).toBe('wrong');
    expect(compares.n).toBe(1);
    const email = await account(`known-${pg}@example.test`);
    expect(await signIn(email, 'some-password')).toBe('wrong');
    expect(compares.n).toBe(2);
  });

  it('makes each attempt after 5 failures wait a growing delay, without checking the password meanwhile, instead of locking the owner out', async () => {
    const { peekSignIn, UNKNOWN_ADDRESS } = await import('@/lib/auth/throttle');
    const email = await account(`delay-${pg}@example.test`);
    let t = Date.now();
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(t);
    const later = (seconds: number) => vi.setSystemTime((t += seconds * 1000));
    for (let i = 0; i < 5; i++) expect(await signIn(email, `wrong-${i}`)).toBe('wrong');
    compares.n = 0;
    // while the 30 s run the correct password is not even checked
    expect(await signIn(email, DEMO_PASSWORD)).toBe('throttled');
    expect(await peekSignIn(k, email, UNKNOWN_ADDRESS)).toEqual({ allowed: false, retryAfterSeconds: 30 });
    later(29);
    expect(await signIn(email, DEMO_PASSWORD)).toBe('throttled');
    expect(compares.n).toBe(0);
    later(2);
    expect(await signIn(email, 'wrong-6')).toBe('wrong');
    // the wait doubles with each further failure
    expect(await peekSignIn(k, email, UNKNOWN_ADDRESS)).toEqual({ allowed: false, retryAfterSeconds: 60 });
    later(61);
    expect(await signIn(email, 'wrong-7')).toBe('wrong');
    expect(await peekSignIn(k, email, UNKNOWN_ADDRESS)).toEqual({ allowed: false, retryAfterSeconds: 120 });
    later(121);
    // no 15-minute lock-out: three and a half minutes after the fifth failure the owner signs in
    expect(await signIn(email, DEMO_PASSWORD)).toBe('ok');
    expect(compares.n).toBe(3);
    // and the good sign-in clears the account's count
    for (let i = 0; i < 5; i++) expect(await signIn(email, `wrong-after-${i}`)).toBe('wrong');
    expect(await signIn(email, 'wrong-sixth')).toBe('throttled');
  });

  it('caps the delay at 15 minutes', async () => {
    const { peekSignIn, UNKNOWN_ADDRESS } = await import('@/lib/auth/throttle');
    const email = await account(`cap-${pg}@example.test`);
    let t = Date.now();
    vi.useFakeTimers({ toFake: ['Date'] });
    vi.setSystemTime(t);
    let wait = 0;
    for (let i = 0; i < 12; i++) {
      vi.setSystemTime((t += wait * 1000 + 1000));
      expect(await signIn(email, `wrong-${i}`)).toBe('wrong');
      const state = await peekSignIn(k, email, UNKNOWN_ADDRESS);
      wait = state.allowed ? 0 : state.retryAfterSeconds;
    }
    expect(wait).toBe(15 * 60);
  });

  it('with the socket address known (no trusted proxy), guesses from one address do not delay the owner at another', async () => {
    const { installPeerAddressStamp, PEER_HEADER } = await import('@/lib/auth/peer-address');
    installPeerAddressStamp(); // as instrumentation.ts does in the server
    const email = await account(`owner-${pg}@example.test`);
    const attacker = { [PEER_HEADER]: '203.0.113.66', 'x-forwarded-for': '192.0.2.10' };
    const outcomes: Outcome[] = [];
    for (let i = 0; i < 10; i++) outcomes.push(await signIn(email, `guess-${i}`, attacker));
    expect(tally(outcomes)).toEqual({ ok: 0, wrong: 5, throttled: 5 });
    // the attacker's made-up X-Forwarded-For is not the owner's address: only the socket counts
    expect(await signIn(email, DEMO_PASSWORD, { [PEER_HEADER]: '192.0.2.10' })).toBe('ok');
  });

  it('limits one address to 20 attempts in 15 minutes across accounts (password spraying), counting them before bcrypt', async () => {
    const { installPeerAddressStamp, PEER_HEADER } = await import('@/lib/auth/peer-address');
    installPeerAddressStamp();
    const sprayer = { [PEER_HEADER]: '198.51.100.77' };
    const emails = await Promise.all(Array.from({ length: 25 }, (_, i) => account(`spray${i}-${pg}@example.test`)));
    compares.n = 0;
    const attempts = emails.flatMap((email) => Array.from({ length: 4 }, (_, j) => signIn(email, `spray-${j}`, sprayer)));
    expect(tally(await Promise.all(attempts))).toEqual({ ok: 0, wrong: 20, throttled: 80 });
    expect(compares.n).toBe(20);
    // other callers are not affected
    expect(await signIn(emails[24], DEMO_PASSWORD, { [PEER_HEADER]: '198.51.100.78' })).toBe('ok');
  });

  it('delays an account after 20 failures from any mix of addresses (a new X-Forwarded-For per try does not buy more guesses)', async () => {
    vi.stubEnv('HAULCASE_TRUSTED_PROXY', '1');
    const email = await account(`rotating-${pg}@example.test`);
    for (let i = 0; i < 20; i++) expect(await signIn(email, `guess-${i}`, { 'x-forwarded-for': `10.1.${i}.1` })).toBe('wrong');
    compares.n = 0;
    expect(await signIn(email, DEMO_PASSWORD, { 'x-forwarded-for': '10.9.9.9' })).toBe('throttled');
    expect(compares.n).toBe(0);
  });

  it('a good sign-in does not count against its address', async () => {
    const { installPeerAddressStamp, PEER_HEADER } = await import('@/lib/auth/peer-address');
    installPeerAddressStamp();
    const office = { [PEER_HEADER]: '192.0.2.200' };
    const emails = await Promise.all(Array.from({ length: 30 }, (_, i) => account(`office${i}-${pg}@example.test`)));
    for (const email of emails) expect(await signIn(email, DEMO_PASSWORD, office)).toBe('ok');
  });

  it('answers 429 with Retry-After from the callback route while the caller must wait', async () => {
    vi.stubEnv('HAULCASE_TRUSTED_PROXY', '1');
    const { POST } = await import('@/app/api/auth/[...nextauth]/route');
    const email = await account(`route-${pg}@example.test`);
    const from = { 'x-forwarded-for': '203.0.113.99' };
    for (let i = 0; i < 5; i++) expect(await signIn(email, `wrong-${i}`, from)).toBe('wrong');
    const form = new FormData();
    form.set('email', email);
    form.set('password', DEMO_PASSWORD);
    const r = await call(POST as unknown as Parameters<typeof call>[0], { nextauth: ['callback', 'credentials'] } as unknown as Record<string, string>, { body: form, headers: from, url: 'http://127.0.0.1/api/auth/callback/credentials' });
    expect(r.status).toBe(429);
    expect(Number(r.response.headers.get('retry-after'))).toBeGreaterThanOrEqual(29);
    expect(r.body.error).toMatch(/^Too many failed sign-ins for this account or from your address\. Try again in \d+ seconds\.$/);
  });
});
