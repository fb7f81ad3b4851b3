import 'server-only';
/**
 * The mail outbox (`mail_outbox`, migration 0011). Mail is written with
 * `enqueueMail(trx, …)` inside the transaction of the change that causes it,
 * so it exists exactly when the change does; a sender then delivers due rows:
 * after each commit (`mailCommitted()`), every OUTBOX.intervalMs from a timer
 * that instrumentation.ts starts (which also sends what a process that died
 * left behind), and on demand in tests (`flushOutbox()`).
 *
 * A row is claimed with a conditional update (its status and attempt count as
 * read) before it is sent, so two servers never send one row at once; the
 * claim lapses after OUTBOX.claimMs, so a row whose sender died mid-send is
 * sent again (at least once, never lost). A failed attempt is retried after
 * OUTBOX.baseDelayMs · 2^(attempt − 1) (at most OUTBOX.maxDelayMs); after
 * OUTBOX.maxAttempts the row is marked failed and logged.
 */
import type { Knex } from 'knex';
import { db } from '@/lib/db';
import { sendMail, type OutgoingMail } from './send';

export const OUTBOX = {
  maxAttempts: 8,
  baseDelayMs: 30_000,
  maxDelayMs: 60 * 60_000,
  /** How long a claimed row is left to its sender (a send times out well before). */
  claimMs: 5 * 60_000,
  batch: 20,
  intervalMs: 15_000,
} as const;

export type OutboxStatus = 'pending' | 'sending' | 'sent' | 'failed';

/** Wait before attempt `attempts + 1`, after `attempts` failed ones. */
export function retryDelayMs(attempts: number): number {
  return Math.min(OUTBOX.maxDelayMs, OUTBOX.baseDelayMs * 2 ** Math.max(0, attempts - 1));
}

const iso = (d: Date) => d.toISOString();
const later = (d: Date, ms: number) => iso(new Date(d.getTime() + ms));

/** Writes one message to the outbox, in the caller's transaction. Nothing to write for no recipient. */
export async function enqueueMail(trx: Knex | Knex.Transaction, m: OutgoingMail, now = new Date()): Promise<void> {
  if (m.to.length === 0) return;
  await trx('mail_outbox').insert({
    workspaceSlug: m.workspace ?? null,
    toAddresses: JSON.stringify(m.to),
    subject: m.subject.slice(0, 500),
    text: m.text,
    html: m.html,
    status: 'pending',
    attempts: 0,
    nextAttemptAt: iso(now),
    createdAt: iso(now),
  });
}

export type DeliveryReport = { sent: number; retried: number; failed: number };

/**
 * Sends every due row once: claims it, sends it, then marks it sent, or
 * pending again with its back-off, or failed. `now` is for tests.
 */
export async function deliverDueMail(o: { k?: Knex; now?: () => Date } = {}): Promise<DeliveryReport> {
  const k = o.k ?? db();
  const now = o.now ?? (() => new Date());
  const report: DeliveryReport = { sent: 0, retried: 0, failed: 0 };
  const seen = new Set<number>();
  for (;;) {
    const at = now();
    const due: Array<{ id: number; status: OutboxStatus; attempts: number }> = await k('mail_outbox')
      .whereIn('status', ['pending', 'sending'])
      .where('nextAttemptAt', '<=', iso(at))
      .whereNotIn('id', [...seen]) // each row at most once per run
      .orderBy('id')
      .limit(OUTBOX.batch)
      .select('id', 'status', 'attempts');
    if (due.length === 0) break;
    for (const row of due) {
      seen.add(row.id);
      const attempt = row.attempts + 1;
      const claimed = await k('mail_outbox')
        .where({ id: row.id, status: row.status, attempts: row.attempts })
        .where('nextAttemptAt', '<=', iso(at))
        .update({ status: 'sending', attempts: attempt, nextAttemptAt: later(at, OUTBOX.claimMs) });
      if (claimed !== 1) continue; // another sender has it
      const m = await k('mail_outbox').where({ id: row.id }).first();
      const r = await sendMail({ to: JSON.parse(m.toAddresses), subject: m.subject, text: m.text, html: m.html, workspace: m.workspaceSlug ?? undefined });
      const mine = k('mail_outbox').where({ id: row.id, status: 'sending', attempts: attempt });
      const done = now();
      if (r.ok) {
        await mine.update({ status: 'sent', sentAt: iso(done), lastError: null });
        report.sent++;
      } else if (attempt >= OUTBOX.maxAttempts) {
        await mine.update({ status: 'failed', lastError: (r.error ?? 'unknown error').slice(0, 1000) });
        console.error(`[haulcase] mail ${row.id} ("${m.subject}") not sent after ${attempt} attempts, given up: ${r.error}`);
        report.failed++;
      } else {
        await mine.update({ status: 'pending', nextAttemptAt: later(done, retryDelayMs(attempt)), lastError: (r.error ?? 'unknown error').slice(0, 1000) });
        console.error(`[haulcase] mail ${row.id} not sent (attempt ${attempt} of ${OUTBOX.maxAttempts}), retried in ${retryDelayMs(attempt) / 1000} s: ${r.error}`);
        report.retried++;
      }
    }
  }
  return report;
}

// One sender loop per process, shared by instrumentation and route bundles through globalThis.
type KickMode = 'background' | 'await' | 'off';
const holder = globalThis as unknown as {
  __haulcaseOutbox?: { running: Promise<void> | null; again: boolean; mode: KickMode; timer: NodeJS.Timeout | null };
};
const state = () => (holder.__haulcaseOutbox ??= { running: null, again: false, mode: 'background', timer: null });

/** Runs the sender now, or once more after the run in progress; resolves when it has finished. Never rejects. */
export function kickOutbox(): Promise<void> {
  const s = state();
  if (s.running) {
    s.again = true;
    return s.running;
  }
  s.running = (async () => {
    try {
      do {
        s.again = false;
        await deliverDueMail();
      } while (s.again);
    } catch (err) {
      console.error('[haulcase] the mail outbox sender stopped on an error (the timer tries again):', err);
    } finally {
      s.running = null;
    }
  })();
  return s.running;
}

/**
 * Call after the transaction that enqueued mail has committed: starts the
 * sender without waiting for it (the answer never waits for SMTP), except in
 * tests that ask to wait (`setOutboxKicksForTests('await')`) or to leave the
 * rows for a later sender (`'off'`, a process that dies right after the commit).
 */
export async function mailCommitted(): Promise<void> {
  const s = state();
  if (s.mode === 'off') return;
  const run = kickOutbox();
  if (s.mode === 'await') await run;
}

/** Start-up (instrumentation.ts): send what is due now, then every OUTBOX.intervalMs; the timer never keeps the process alive. */
export function startOutboxSender(intervalMs: number = OUTBOX.intervalMs): { firstRun: Promise<void>; stop: () => void } {
  const s = state();
  if (s.timer) clearInterval(s.timer);
  const timer = setInterval(() => void kickOutbox(), intervalMs);
  timer.unref();
  s.timer = timer;
  return {
    firstRun: kickOutbox(),
    stop: () => {
      clearInterval(timer);
      if (s.timer === timer) s.timer = null;
    },
  };
}

/** Tests: wait for the post-commit send ('await'), skip it ('off'), or behave as the server does ('background'). */
export function setOutboxKicksForTests(mode: KickMode): void {
  state().mode = mode;
}

/** Tests: waits for a sender run in progress, then sends everything due. */
export async function flushOutbox(o: { now?: () => Date } = {}): Promise<DeliveryReport> {
  const s = state();
  if (s.running) await s.running;
  return deliverDueMail(o);
}
