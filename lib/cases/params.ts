import { notFound } from '@/lib/http';

/** A case id from the URL: anything but a positive whole number is simply not found. */
export function parseCaseId(raw: string): number {
  if (!/^\d{1,9}$/.test(raw) || Number(raw) < 1) throw notFound('No such business case in this workspace.');
  return Number(raw);
}
