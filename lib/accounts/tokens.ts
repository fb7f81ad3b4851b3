import { randomBytes } from 'node:crypto';
import { hashToken } from '@/lib/approvals/canonical';
import { HttpError } from '@/lib/http';

/** A fresh single-use token for a link: 256 random bits, URL-safe. Only its SHA-256 is stored. */
export const newToken = (): string => randomBytes(32).toString('base64url');

export { hashToken };

export const INVITATION_DAYS = 7;
export const RESET_MINUTES = 60;

export const addMinutes = (from: Date, minutes: number) => new Date(from.getTime() + minutes * 60_000).toISOString();

/**
 * Refuses a token row that was used or has expired (410: the link is gone for
 * good), and a token with no row (404, or 410 with `unknown: 410`).
 */
export function assertUsable(row: { usedAt: string | null; expiresAt: string } | undefined, what: string, now = new Date(), unknown: 404 | 410 = 404): asserts row {
  if (!row) throw new HttpError(unknown, `This ${what} link is not valid. Check that you copied all of it, or ask for a new one.`);
  if (row.usedAt) throw new HttpError(410, `This ${what} link has already been used. Links work once.`);
  if (row.expiresAt <= now.toISOString()) throw new HttpError(410, `This ${what} link has expired. Ask for a new one.`);
}
