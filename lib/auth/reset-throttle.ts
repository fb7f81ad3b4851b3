import type { Knex } from 'knex';
import { UNKNOWN_ADDRESS } from './throttle';

/**
 * "Forgot password" requests allowed inside the window: per e-mail (so nobody
 * can flood one inbox) and per address (so one caller cannot mail many).
 */
export const RESET_THROTTLE = { windowMinutes: 15, perEmail: 3, perAddress: 10 } as const;

export type ResetThrottleState = { allowed: true } | { allowed: false; retryAfterSeconds: number };

/**
 * Checks the limits and, when the request may go ahead, records it; a refused
 * request is not recorded, so waiting out the window always works. The answer
 * is the same for an address with or without an account.
 */
export async function admitResetRequest(k: Knex, email: string, address: string, now = new Date()): Promise<ResetThrottleState> {
  const windowMs = RESET_THROTTLE.windowMinutes * 60_000;
  const since = new Date(now.getTime() - windowMs).toISOString();
  const stats = async (where: Record<string, string>) => {
    const [r] = (await k('password_reset_requests').where(where).andWhere('at', '>', since).select(k.raw('count(*) as n'), k.raw('min(at) as first'))) as Array<{ n: string | number; first: string | null }>;
    return { n: Number(r.n), first: r.first };
  };
  const over = [
    { ...(await stats({ email })), limit: RESET_THROTTLE.perEmail },
    // with no trusted proxy every caller shares one address: that limit would lock everyone out
    ...(address === UNKNOWN_ADDRESS ? [] : [{ ...(await stats({ address })), limit: RESET_THROTTLE.perAddress }]),
  ].filter((x) => x.n >= x.limit && x.first);
  if (over.length) {
    const until = Math.max(...over.map((x) => new Date(x.first as string).getTime() + windowMs));
    return { allowed: false, retryAfterSeconds: Math.max(1, Math.ceil((until - now.getTime()) / 1000)) };
  }
  await k('password_reset_requests').insert({ email, address, at: now.toISOString() });
  // Old rows are only ever read inside the window; drop them as we go.
  await k('password_reset_requests').where('at', '<', new Date(now.getTime() - 24 * 3_600_000).toISOString()).delete();
  return { allowed: true };
}

