import type { Knex } from 'knex';
import { nowIso } from '../time';

/**
 * Failed sign-ins allowed inside the window: per account and address, per address alone,
 * and per account from any address (so changing addresses does not buy unlimited guesses).
 */
export const THROTTLE = { windowMinutes: 15, perAccountAndAddress: 5, perAddress: 30, perAccount: 20 } as const;

/** The address when no trusted proxy tells it: per-address limits are then skipped, as they would be shared by everyone. */
export const UNKNOWN_ADDRESS = 'unknown';

export type ThrottleState = { locked: false } | { locked: true; retryAfterSeconds: number };

const norm = (email: string) => email.trim().toLowerCase();

/** Whether further sign-in attempts for this account from this address must wait. */
export async function checkSignInThrottle(k: Knex, email: string, address: string, now = new Date()): Promise<ThrottleState> {
  const since = new Date(now.getTime() - THROTTLE.windowMinutes * 60_000).toISOString();
  const failures = (q: Knex.QueryBuilder) => q.where('succeeded', false).andWhere('at', '>', since);
  type Row = { n: string | number; first: string | null };
  const stats = async (where: Record<string, string>): Promise<Row> => {
    const rows = (await failures(k('sign_in_attempts').where(where)).select(
      k.raw('count(*) as n'),
      k.raw('min(at) as first'),
    )) as Row[];
    return rows[0];
  };
  const rules: Array<{ where: Record<string, string>; limit: number }> = [
    { where: { email: norm(email), address }, limit: THROTTLE.perAccountAndAddress },
    { where: { email: norm(email) }, limit: THROTTLE.perAccount },
    ...(address === UNKNOWN_ADDRESS ? [] : [{ where: { address }, limit: THROTTLE.perAddress }]),
  ];
  const over: Array<{ first: string }> = [];
  for (const rule of rules) {
    const row = await stats(rule.where);
    if (Number(row.n) >= rule.limit) over.push({ first: row.first ?? '' });
  }
  if (!over.length) return { locked: false };
  const until = Math.max(...over.map((x) => new Date(x.first).getTime() + THROTTLE.windowMinutes * 60_000));
  return { locked: true, retryAfterSeconds: Math.max(1, Math.ceil((until - now.getTime()) / 1000)) };
}

export async function recordSignInAttempt(k: Knex, email: string, address: string, succeeded: boolean): Promise<void> {
  await k('sign_in_attempts').insert({ email: norm(email), address, succeeded, at: nowIso() });
  if (succeeded) {
    // A good sign-in clears that account's failures from this address.
    await k('sign_in_attempts').where({ email: norm(email), address, succeeded: false }).delete();
  }
}

/**
 * The caller's address as the app sees it. Forwarding headers are set by whoever sends
 * the request, so they are read only when `HAULCASE_TRUSTED_PROXY=1` says a proxy in
 * front of the app sets them (then its X-Forwarded-For entry, the right-most, is used).
 */
export function clientAddress(
  headers: Headers | Record<string, string | string[] | undefined>,
  env: Record<string, string | undefined> = process.env,
): string {
  if (env.HAULCASE_TRUSTED_PROXY !== '1') return UNKNOWN_ADDRESS;
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  const hops = (get('x-forwarded-for') ?? '').split(',').map((h) => h.trim()).filter(Boolean);
  return (hops[hops.length - 1] || get('x-real-ip') || UNKNOWN_ADDRESS).slice(0, 64);
}
