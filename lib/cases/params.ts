import { idParams } from '@/lib/http';
import { z } from '@/lib/validation/zod';

/** The longest unit number the register stores (lib/validation/fleet.ts, keyText). */
const UNIT_MAX = 80;

/** What a unit number can be: not empty, not too long, no control characters, well-formed UTF-16. */
function isUnitNumber(decoded: string): boolean {
  // eslint-disable-next-line no-control-regex
  return decoded.length > 0 && decoded.length <= UNIT_MAX && !/[\u0000-\u001f\u007f]/.test(decoded) && decoded.isWellFormed();
}

const NOT_A_UNIT = 'must be a unit number';

/**
 * A truck's unit number as a route handler receives it: Next hands route
 * handlers their dynamic segments decoded, so it is used as it is. Decoding it
 * again turned the unit "T%41" into "TA" (another truck) and made "50%" throw
 * (a 500 under the truck page). What no unit number can be (empty, too long,
 * control characters, broken UTF-16) does not match (`readParams`: 404).
 */
export const unitParam = z.string().refine(isUnitNumber, NOT_A_UNIT);

/**
 * A truck's unit number from a page's dynamic segment. Pages receive the
 * segment as it was in the URL (the link encodes the unit once:
 * "T%41" → T%2541), so it is decoded exactly once; a segment that is not valid
 * percent-encoding does not match (`readPageParams`: the not-found page), never
 * a thrown URIError. tests/e2e/truck-route.test.ts pins both halves against the
 * real server.
 */
export const unitPageParam = z.string().transform((raw, ctx) => {
  let decoded: string;
  try {
    decoded = decodeURIComponent(raw);
  } catch {
    ctx.addIssue({ code: 'custom', message: 'is not valid percent-encoding' });
    return z.NEVER;
  }
  if (!isUnitNumber(decoded)) {
    ctx.addIssue({ code: 'custom', message: NOT_A_UNIT });
    return z.NEVER;
  }
  return decoded;
});

/** `…/cases/[id]/trucks/[truckId]` in a route handler. */
export const caseTruckParams = idParams.extend({ truckId: unitParam });

/** `…/cases/[id]/trucks/[truckId]` in a page. */
export const caseTruckPageParams = idParams.extend({ truckId: unitPageParam });
