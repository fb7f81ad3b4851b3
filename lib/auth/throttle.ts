import type { Knex } from 'knex';
import { nowIso } from '../time';

/** Failed sign-ins allowed per account and address inside the window, and per address alone. */
export const THROTTLE = { windowMinutes: 15, perAccountAndAddress: 5, perAddress: 30 } as const;

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
  const pair = [await stats({ email: norm(email), address })];
  const byAddress = [await stats({ address })];
  const over = [
    { n: Number(pair[0].n), first: pair[0].first ?? '', limit: THROTTLE.perAccountAndAddress },
    { n: Number(byAddress[0].n), first: byAddress[0].first ?? '', limit: THROTTLE.perAddress },
  ].filter((x) => x.n >= x.limit);
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

/** The caller's address as the app sees it (first X-Forwarded-For hop behind a proxy). */
export function clientAddress(headers: Headers | Record<string, string | string[] | undefined>): string {
  const get = (name: string): string | undefined => {
    if (headers instanceof Headers) return headers.get(name) ?? undefined;
    const v = headers[name];
    return Array.isArray(v) ? v[0] : v;
  };
  const forwarded = get('x-forwarded-for')?.split(',')[0]?.trim();
  return (forwarded || get('x-real-ip') || 'local').slice(0, 64);
}
