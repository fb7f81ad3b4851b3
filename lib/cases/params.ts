import { notFound } from '@/lib/http';

/** A case id from the URL: anything but a positive whole number is simply not found. */
export function parseCaseId(raw: string): number {
  if (!/^\d{1,9}$/.test(raw) || Number(raw) < 1) throw notFound('No such business case in this workspace.');
  return Number(raw);
}

/** The longest unit number the register stores (lib/validation/fleet.ts, keyText). */
const UNIT_MAX = 80;

/**
 * A truck's unit number as a route handler receives it: Next hands route
 * handlers their dynamic segments decoded, so it is used as it is. Decoding it
 * again turned the unit "T%41" into "TA" (another truck) and made "50%" throw
 * (a 500 under the truck page). What no unit number can be (empty, too long,
 * control characters, broken UTF-16) is null.
 */
export function truckIdFromParam(decoded: string): string | null {
  // eslint-disable-next-line no-control-regex
  if (decoded.length === 0 || decoded.length > UNIT_MAX || /[\u0000-\u001f\u007f]/.test(decoded) || !decoded.isWellFormed()) return null;
  return decoded;
}

/** The same in a route handler: anything that cannot be a unit number is a 404. */
export function parseTruckParam(decoded: string): string {
  const id = truckIdFromParam(decoded);
  if (id === null) throw notFound('No such truck in this case.');
  return id;
}

/**
 * A truck's unit number from a page's dynamic segment. Pages receive the
 * segment as it was in the URL (the link encodes the unit once:
 * "T%41" → T%2541), so it is decoded exactly once; a segment that is not valid
 * percent-encoding is null (the page answers 404), never a thrown URIError.
 * tests/e2e/truck-route.test.ts pins both halves against the real server.
 */
export function truckIdFromPageSegment(raw: string): string | null {
  let decoded: string;
  try {
    decoded = decodeURIComponent(raw);
  } catch {
    return null;
  }
  return truckIdFromParam(decoded);
}
