import type { Knex } from 'knex';
import { peerStampInstalled, PEER_HEADER } from './peer-address';

/**
 * Throttles on counters in `throttle_counters` (migration 0012). An attempt is
 * counted, with its rows locked, before anything slow or secret runs (the
 * password check): `admit` decides and counts in one transaction, so a burst of
 * concurrent attempts is admitted one by one and at most the limit gets through.
 *
 * Two kinds of rule:
 * - `delay`: the first `free` attempts go through; after that each further
 *   attempt must wait `baseSeconds · 2^(n − free)` after the previous one (n
 *   attempts counted), at most `capSeconds`. Nothing is locked for good: after
 *   the wait the next attempt is checked. Counts are forgotten `forgetSeconds`
 *   after the last attempt.
 * - `window`: at most `limit` attempts in a fixed window of `windowSeconds`
 *   starting at the first.
 * A refused attempt is not counted, so waiting always works.
 */
export type Rule =
  | { key: string; kind: 'window'; limit: number; windowSeconds: number }
  | { key: string; kind: 'delay'; free: number; baseSeconds: number; capSeconds: number; forgetSeconds: number };

export type Admission = { allowed: true } | { allowed: false; retryAfterSeconds: number };

type Counter = { key: string; count: number; since: string; nextAt: string | null };

const iso = (ms: number) => new Date(ms).toISOString();

function isStale(rule: Rule, row: Counter, now: number): boolean {
  const since = Date.parse(row.since);
  return rule.kind === 'window' ? since + rule.windowSeconds * 1000 <= now : since + rule.forgetSeconds * 1000 <= now;
}

/** Milliseconds the rule makes an attempt wait now (0: admitted). */
function waitMs(rule: Rule, row: Counter | undefined, now: number): number {
  if (!row || !row.nextAt || isStale(rule, row, now)) return 0;
  return Math.max(0, Date.parse(row.nextAt) - now);
}

/** The counter after one more admitted attempt. */
function counted(rule: Rule, row: Counter | undefined, now: number): Omit<Counter, 'key'> {
  const stale = !row || isStale(rule, row, now);
  const count = (stale ? 0 : Number(row.count)) + 1;
  if (rule.kind === 'window') {
    const since = stale ? now : Date.parse(row.since);
    return { count, since: iso(since), nextAt: count >= rule.limit ? iso(since + rule.windowSeconds * 1000) : null };
  }
  const delay = count >= rule.free ? Math.min(rule.capSeconds, rule.baseSeconds * 2 ** (count - rule.free)) : 0;
  return { count, since: iso(now), nextAt: delay ? iso(now + delay * 1000) : null };
}

const refused = (ms: number): Admission => ({ allowed: false, retryAfterSeconds: Math.max(1, Math.ceil(ms / 1000)) });

const isPg = (k: Knex) => String(k.client.config.client).startsWith('pg');

/**
 * Decides and counts one attempt under every rule, atomically: the counter rows
 * are created if missing, then locked (PostgreSQL `FOR UPDATE`, in key order so
 * two attempts never wait on each other; SQLite runs one transaction at a time),
 * checked and, when every rule admits the attempt, moved on.
 */
export async function admit(k: Knex, rules: Rule[], now = new Date()): Promise<Admission> {
  if (rules.length === 0) return { allowed: true };
  const t = now.getTime();
  const keys = [...new Set(rules.map((r) => r.key))].sort();
  const result = await k.transaction(async (trx) => {
    await trx('throttle_counters')
      .insert(keys.map((key) => ({ key, count: 0, since: iso(t), nextAt: null })))
      .onConflict('key')
      .ignore();
    const q = trx('throttle_counters').whereIn('key', keys).orderBy('key').select('key', 'count', 'since', 'nextAt');
    const rows = new Map(((await (isPg(trx) ? q.forUpdate() : q)) as Counter[]).map((r) => [r.key, r]));
    const wait = Math.max(...rules.map((r) => waitMs(r, rows.get(r.key), t)));
    if (wait > 0) return refused(wait);
    for (const rule of rules) await trx('throttle_counters').where({ key: rule.key }).update(counted(rule, rows.get(rule.key), t));
    return { allowed: true } as const;
  });
  // rows are only read inside their window (an hour at most); drop long-idle ones as we go
  await k('throttle_counters').where('since', '<', iso(t - 24 * 3_600_000)).delete();
  return result;
}

/** Whether `admit` would refuse now, without counting anything (for an early 429). */
export async function peek(k: Knex, rules: Rule[], now = new Date()): Promise<Admission> {
  if (rules.length === 0) return { allowed: true };
  const rows = new Map(((await k('throttle_counters').whereIn('key', rules.map((r) => r.key)).select('key', 'count', 'since', 'nextAt')) as Counter[]).map((r) => [r.key, r]));
  const wait = Math.max(...rules.map((r) => waitMs(r, rows.get(r.key), now.getTime())));
  return wait > 0 ? refused(wait) : { allowed: true };
}

/** The address when neither a trusted proxy nor the server's socket tells it. */
export const UNKNOWN_ADDRESS = 'unknown';

/**
 * Sign-in rules. Failed attempts per account from one address get growing
 * delays after 5 (30 s, 1 min, 2 min, … at most 15 min), so the owner is never
 * locked out for long and an attacker at another address does not delay the
 * owner at all until the per-account rule (20, any address) applies; one
 * address gets 20 attempts in 15 minutes across all accounts (password spraying).
 * Every attempt is counted before the password is checked; a good sign-in then
 * clears the account's counters and takes itself off the address count.
 */
export const SIGN_IN_THROTTLE = {
  perAccountAndAddressFree: 5,
  perAccountFree: 20,
  baseDelaySeconds: 30,
  maxDelaySeconds: 15 * 60,
  forgetMinutes: 60,
  perAddress: 20,
  perAddressWindowMinutes: 15,
} as const;

const norm = (email: string) => email.trim().toLowerCase();

export function signInRules(email: string, address: string): Rule[] {
  const T = SIGN_IN_THROTTLE;
  const delay = { kind: 'delay' as const, baseSeconds: T.baseDelaySeconds, capSeconds: T.maxDelaySeconds, forgetSeconds: T.forgetMinutes * 60 };
  return [
    // with no address known every caller shares UNKNOWN_ADDRESS: this is then the account's rule
    { key: `signin:account-address:${norm(email)}|${address}`, free: T.perAccountAndAddressFree, ...delay },
    { key: `signin:account:${norm(email)}`, free: T.perAccountFree, ...delay },
    // a shared unknown address would make this a limit on everyone together
    ...(address === UNKNOWN_ADDRESS ? [] : [{ key: `signin:address:${address}`, kind: 'window' as const, limit: T.perAddress, windowSeconds: T.perAddressWindowMinutes * 60 }]),
  ];
}

/** Counts a sign-in attempt before its password is checked; refused attempts must not check it. */
export const admitSignIn = (k: Knex, email: string, address: string, now = new Date()) => admit(k, signInRules(email, address), now);

/** Whether a sign-in attempt would be refused now (nothing counted). */
export const peekSignIn = (k: Knex, email: string, address: string, now = new Date()) => peek(k, signInRules(email, address), now);

/** After the password check: a good sign-in clears the account's counters and does not count against the address. */
export async function settleSignIn(k: Knex, email: string, address: string, succeeded: boolean): Promise<void> {
  if (!succeeded) return;
  const [accountAddress, account, byAddress] = signInRules(email, address);
  await k('throttle_counters').whereIn('key', [accountAddress.key, account.key]).delete();
  if (byAddress) await k('throttle_counters').where({ key: byAddress.key }).where('count', '>', 0).update({ count: k.raw('?? - 1', ['count']), nextAt: null });
}

/** Password reset with a token (the link): 10 attempts per address in 15 minutes, every attempt counted. */
export const RESET_TOKEN_THROTTLE = { perAddress: 10, windowMinutes: 15 } as const;

export function resetTokenRules(address: string): Rule[] {
  if (address === UNKNOWN_ADDRESS) return [];
  return [{ key: `reset:address:${address}`, kind: 'window', limit: RESET_TOKEN_THROTTLE.perAddress, windowSeconds: RESET_TOKEN_THROTTLE.windowMinutes * 60 }];
}

export const admitResetToken = (k: Knex, address: string, now = new Date()) => admit(k, resetTokenRules(address), now);

/** "Try again in 40 seconds" / "in 3 minutes". */
export function waitText(seconds: number): string {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const minutes = Math.ceil(seconds / 60);
  return `${minutes} minute${minutes === 1 ? '' : 's'}`;
}

/**
 * The caller's address as the app sees it. Forwarding headers are set by whoever
 * sends the request, so they are read only when `HAULCASE_TRUSTED_PROXY=1` says a
 * proxy in front of the app sets them (then its X-Forwarded-For entry, the
 * right-most, is used). Otherwise the address of the connection's socket, which
 * the server stamps on each request (`lib/auth/peer-address.ts`, installed from
 * instrumentation.ts; Next gives route handlers no socket); without the stamp
 * (a handler called outside the server) it is UNKNOWN_ADDRESS.
 */
export function clientAddress(
  headers: Headers | Record<string, string | string[] | undefined>,
  env: Record<string, string | undefined> = process.env,
): string {
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  if (env.HAULCASE_TRUSTED_PROXY === '1') {
    const hops = (get('x-forwarded-for') ?? '').split(',').map((h) => h.trim()).filter(Boolean);
    return (hops[hops.length - 1] || get('x-real-ip') || UNKNOWN_ADDRESS).slice(0, 64);
  }
  if (!peerStampInstalled()) return UNKNOWN_ADDRESS;
  return (get(PEER_HEADER) || UNKNOWN_ADDRESS).slice(0, 64);
}
