import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { settlePasswordResetRequests } from '@/lib/accounts/password-reset';
import { flushOutbox, setOutboxKicksForTests } from '@/lib/mail/queue';
import { POST as forgot } from '@/app/api/password/forgot/route';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

/** Row counts of every table a reset request may write. */
const counts = async (k: Knex) => {
  const n = async (table: string) => Number((await k(table).count<{ n: number | string }[]>({ n: '*' }))[0].n);
  return { requests: await n('password_reset_requests'), resets: await n('password_resets'), outbox: await n('mail_outbox'), audit: await n('audit_log'), sink: await n('mail_sink') };
};

describe.each(backends)('"forgot password" does the same work on the request path for a known and an unknown address on $name', ({ pg }) => {
  let k: Knex;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ k, close } = await openMailDb(pg));
    signInAs(null);
    setOutboxKicksForTests('off'); // a sender would run after the commit; here rows stay for flushOutbox()
  });
  afterAll(async () => {
    setOutboxKicksForTests('await');
    await close();
  });

  it('answers before looking the address up: only the throttle row is written, for either address; the token and mail follow, queued and not sent', async () => {
    const start = await counts(k);
    const unknown = await call(forgot, {}, { body: { email: 'nobody@aldervane.test' } });
    const afterUnknown = await counts(k);
    const known = await call(forgot, {}, { body: { email: 'approver@aldervane.test' } });
    const afterKnown = await counts(k);
    expect(known.status).toBe(200);
    expect(known.body).toEqual(unknown.body);
    // the same database work when each answer is sent: one throttle row, nothing else
    expect(afterUnknown).toEqual({ ...start, requests: start.requests + 1 });
    expect(afterKnown).toEqual({ ...afterUnknown, requests: afterUnknown.requests + 1 });

    // after the answer: the known address gets its token, audit row and queued mail, in one transaction; nothing is sent yet
    await settlePasswordResetRequests();
    const settled = await counts(k);
    expect(settled).toEqual({ ...afterKnown, resets: afterKnown.resets + 1, outbox: afterKnown.outbox + 1, audit: afterKnown.audit + 1 });
    const row = await k('mail_outbox').orderBy('id', 'desc').first();
    expect(row).toMatchObject({ subject: 'Reset your Haulcase password', status: 'pending', attempts: 0 });
    expect(JSON.parse(row.toAddresses)).toEqual(['approver@aldervane.test']);

    expect(await flushOutbox()).toMatchObject({ sent: 1 });
    expect((await counts(k)).sink).toBe(settled.sink + 1);
  });
});
