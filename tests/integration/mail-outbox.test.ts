/**
 * The mail outbox on SQLite and PostgreSQL: mail is written in the transaction
 * of the change that causes it (and rolled back with it), sent from the table
 * through a real SMTP sink, retried with back-off, given up on after the last
 * attempt, never sent twice by two senders, and still sent when the process
 * died between the commit and the send.
 */
import net from 'node:net';
import { afterAll, afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { POST as submit } from '@/app/api/workspaces/[workspace]/cases/[id]/submit/route';
import { POST as decide } from '@/app/api/workspaces/[workspace]/cases/[id]/decisions/route';
import { POST as forgot } from '@/app/api/password/forgot/route';
import { settlePasswordResetRequests } from '@/lib/accounts/password-reset';
import { GET as outbox } from '@/app/api/workspaces/[workspace]/outbox/route';
import { deliverDueMail, enqueueMail, flushOutbox, OUTBOX, retryDelayMs, setOutboxKicksForTests, startOutboxSender } from '@/lib/mail/queue';
import { useMailSinkForTests, type MailSink } from '@/lib/mail/sink';
import { openMailDb } from './support/mail-db';
import { call } from './support/call';
import { insertDraftCase } from './support/cases';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const backends = [
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
];

/** A loopback port nothing listens on: every SMTP connection to it is refused. */
async function closedPort(): Promise<number> {
  const s = net.createServer();
  await new Promise<void>((r) => s.listen(0, '127.0.0.1', () => r()));
  const port = (s.address() as net.AddressInfo).port;
  await new Promise<void>((r) => s.close(() => r()));
  return port;
}

describe.each(backends)('the mail outbox on $name', ({ pg }) => {
  let k: Knex;
  let sink: MailSink;
  let close: () => Promise<void>;
  let ids: Record<string, number>;
  const p = (id: number) => ({ workspace: WS, id: String(id) });
  const mail = { to: ['someone@aldervane.test'], subject: 'Outbox test', text: 'Hello', html: '<p>Hello</p>', workspace: WS };

  beforeAll(async () => {
    ({ k, sink, close, ids } = await openMailDb(pg));
  });
  afterAll(async () => close());
  afterEach(async () => {
    useMailSinkForTests(sink); // back to the live sink, post-commit sends awaited
    await k('mail_outbox').del();
    await k('mail_sink').del();
  });

  it('writes the mail in the submitting and the approving transaction; a process that dies before sending still delivers it on its next start', async () => {
    setOutboxKicksForTests('off'); // commit, then the process dies before its post-commit send
    const id = await insertDraftCase(k, WS, 'Outbox crash case');
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: { comment: 'Please look.' } })).status).toBe(200);
    signInAs(ids['approver@aldervane.test']);
    expect((await call(decide, p(id), { body: { decision: 'approve', comment: 'Fine.' } })).status).toBe(200);
    const rows = await k('mail_outbox').orderBy('id');
    expect(rows.map((r) => [r.subject, JSON.parse(r.toAddresses), r.status, r.attempts])).toEqual([
      ['Approval requested: Outbox crash case', ['approver@aldervane.test'], 'pending', 0],
      ['Approved: Outbox crash case', ['analyst@aldervane.test'], 'pending', 0],
    ]);
    expect(await k('mail_sink')).toHaveLength(0);

    // a fresh start: instrumentation starts the sender, which sends what is due
    setOutboxKicksForTests('background');
    const sender = startOutboxSender(60_000);
    await sender.firstRun;
    sender.stop();
    const got = await k('mail_sink').orderBy('id');
    expect(got.map((m) => [m.subject, JSON.parse(m.toAddresses), m.workspaceSlug])).toEqual([
      ['Approval requested: Outbox crash case', ['approver@aldervane.test'], WS],
      ['Approved: Outbox crash case', ['analyst@aldervane.test'], WS],
    ]);
    expect(got[0].text).toContain('Please look.');
    const sent = await k('mail_outbox').orderBy('id');
    expect(sent.map((r) => [r.status, r.attempts, r.lastError])).toEqual([['sent', 1, null], ['sent', 1, null]]);
    expect(sent.every((r) => typeof r.sentAt === 'string')).toBe(true);
  });

  it('leaves no mail behind when the transaction that wrote it rolls back', async () => {
    const id = await insertDraftCase(k, WS, 'Outbox rollback case');
    await expect(
      k.transaction(async (trx) => {
        await trx('business_cases').where({ id }).update({ name: 'renamed in a failed transaction' });
        await enqueueMail(trx, mail);
        throw new Error('the change fails after its mail was written');
      }),
    ).rejects.toThrow('the change fails');
    expect(await k('mail_outbox')).toHaveLength(0);
    expect((await k('business_cases').where({ id }).first()).name).toBe('Outbox rollback case');
    // and through a route: a submission refused with a stale version writes no mail
    signInAs(ids['analyst@aldervane.test']);
    expect((await call(submit, p(id), { body: { comment: '', version: 99 } })).status).toBe(409);
    expect(await k('mail_outbox')).toHaveLength(0);
    expect(await k('mail_sink')).toHaveLength(0);
  });

  it('retries a failed send with exponential back-off and delivers it once the server answers', async () => {
    const down = { port: await closedPort(), stop: async () => {} };
    useMailSinkForTests(down);
    const t0 = new Date('2026-03-01T08:00:00.000Z');
    const at = (ms: number) => () => new Date(t0.getTime() + ms);
    await enqueueMail(k, mail, t0);

    expect(await deliverDueMail({ now: at(0) })).toEqual({ sent: 0, retried: 1, failed: 0 });
    let row = await k('mail_outbox').first();
    expect(row).toMatchObject({ status: 'pending', attempts: 1, nextAttemptAt: at(retryDelayMs(1))().toISOString() });
    expect(row.lastError).toMatch(/ECONNREFUSED|connect/i);
    // not due yet: nothing is tried
    expect(await deliverDueMail({ now: at(retryDelayMs(1) - 1) })).toEqual({ sent: 0, retried: 0, failed: 0 });
    expect((await k('mail_outbox').first()).attempts).toBe(1);
    // due, still down: the wait doubles
    expect(await deliverDueMail({ now: at(retryDelayMs(1)) })).toEqual({ sent: 0, retried: 1, failed: 0 });
    row = await k('mail_outbox').first();
    expect(retryDelayMs(2)).toBe(2 * retryDelayMs(1));
    expect(row).toMatchObject({ status: 'pending', attempts: 2, nextAttemptAt: at(retryDelayMs(1) + retryDelayMs(2))().toISOString() });

    useMailSinkForTests(sink);
    expect(await deliverDueMail({ now: at(retryDelayMs(1) + retryDelayMs(2)) })).toEqual({ sent: 1, retried: 0, failed: 0 });
    row = await k('mail_outbox').first();
    expect(row).toMatchObject({ status: 'sent', attempts: 3, lastError: null });
    const got = await k('mail_sink');
    expect(got.map((m) => m.subject)).toEqual(['Outbox test']);
    // sent is sent: a later run sends nothing again
    expect(await flushOutbox({ now: at(10 * OUTBOX.maxDelayMs) })).toEqual({ sent: 0, retried: 0, failed: 0 });
    expect(await k('mail_sink')).toHaveLength(1);
  });

  it('gives up after the last attempt, marks the mail failed and logs it', async () => {
    useMailSinkForTests({ port: await closedPort(), stop: async () => {} });
    const log = vi.spyOn(console, 'error').mockImplementation(() => {});
    try {
      let t = new Date('2026-03-02T08:00:00.000Z').getTime();
      await enqueueMail(k, mail, new Date(t));
      for (let attempt = 1; attempt <= OUTBOX.maxAttempts; attempt++) {
        const r = await deliverDueMail({ now: () => new Date(t) });
        expect(r).toEqual(attempt < OUTBOX.maxAttempts ? { sent: 0, retried: 1, failed: 0 } : { sent: 0, retried: 0, failed: 1 });
        t += retryDelayMs(attempt);
      }
      const row = await k('mail_outbox').first();
      expect(row).toMatchObject({ status: 'failed', attempts: OUTBOX.maxAttempts, sentAt: null });
      expect(log.mock.calls.some((c) => /given up/.test(String(c[0])))).toBe(true);
      // a failed row is never picked up again
      expect(await deliverDueMail({ now: () => new Date(t + 10 * OUTBOX.maxDelayMs) })).toEqual({ sent: 0, retried: 0, failed: 0 });
    } finally {
      log.mockRestore();
    }
  });

  it('never sends one row twice when two senders run at once', async () => {
    for (let i = 0; i < 6; i++) await enqueueMail(k, { ...mail, subject: `Once ${i}` });
    const [a, b] = await Promise.all([deliverDueMail(), deliverDueMail()]);
    expect(a.sent + b.sent).toBe(6);
    const got = (await k('mail_sink').select('subject')).map((m) => m.subject).sort();
    expect(got).toEqual([0, 1, 2, 3, 4, 5].map((i) => `Once ${i}`));
    expect((await k('mail_outbox').select('status', 'attempts')).every((r) => r.status === 'sent' && r.attempts === 1)).toBe(true);
  });

  it('sends a claimed row again once its claim has lapsed (its sender died mid-send)', async () => {
    const t0 = new Date('2026-03-03T08:00:00.000Z');
    await enqueueMail(k, mail, t0);
    // what a sender that died after claiming leaves: sending, claimed until t0 + claimMs
    await k('mail_outbox').update({ status: 'sending', attempts: 1, nextAttemptAt: new Date(t0.getTime() + OUTBOX.claimMs).toISOString() });
    expect(await deliverDueMail({ now: () => new Date(t0.getTime() + OUTBOX.claimMs - 1) })).toEqual({ sent: 0, retried: 0, failed: 0 });
    expect(await deliverDueMail({ now: () => new Date(t0.getTime() + OUTBOX.claimMs) })).toEqual({ sent: 1, retried: 0, failed: 0 });
    expect(await k('mail_outbox').first()).toMatchObject({ status: 'sent', attempts: 2 });
  });

  it('writes a password reset mail in the transaction of its token, and account mail carries no workspace', async () => {
    setOutboxKicksForTests('off');
    expect((await call(forgot, {}, { body: { email: 'viewer@aldervane.test' } })).status).toBe(200);
    await settlePasswordResetRequests(); // the reset is written after the answer
    const [row] = await k('mail_outbox');
    expect(row).toMatchObject({ subject: 'Reset your Haulcase password', workspaceSlug: null, status: 'pending' });
    expect(await k('password_resets').where({ userId: ids['viewer@aldervane.test'] }).whereNull('usedAt')).toHaveLength(1);
    await flushOutbox();
    expect((await k('mail_sink').first()).subject).toBe('Reset your Haulcase password');
  });

  it('lists on the Outbox this workspace\'s mail not sent yet or given up, and no other workspace\'s or account mail', async () => {
    setOutboxKicksForTests('off');
    await enqueueMail(k, { ...mail, subject: 'Waiting here' });
    await enqueueMail(k, { ...mail, subject: 'Theirs', workspace: 'corrin-flats' });
    await enqueueMail(k, { ...mail, subject: 'Account mail', workspace: undefined });
    await enqueueMail(k, { ...mail, subject: 'Given up here' });
    await k('mail_outbox').where({ subject: 'Given up here' }).update({ status: 'failed', attempts: OUTBOX.maxAttempts, lastError: 'connect ECONNREFUSED' });
    await enqueueMail(k, { ...mail, subject: 'Sent here' });
    await k('mail_outbox').where({ subject: 'Sent here' }).update({ status: 'sent', attempts: 1, sentAt: new Date().toISOString() });
    signInAs(ids['admin@aldervane.test']);
    const r = await call(outbox, { workspace: WS });
    expect(r.status).toBe(200);
    expect(r.body.queued.map((m: { subject: string; status: string; attempts: number; lastError: string | null }) => [m.subject, m.status, m.attempts, m.lastError])).toEqual([
      ['Given up here', 'failed', OUTBOX.maxAttempts, 'connect ECONNREFUSED'],
      ['Waiting here', 'pending', 0, null],
    ]);
    expect(r.body.queued[0].to).toEqual(['someone@aldervane.test']);
  });
});

