/**
 * Does a repower offer's engine match the truck's power? The truck's power
 * demand is taken as the rated power of the engine it runs today (its
 * retarding, grade and speed were specified around it). An offer whose engine
 * is rated more than `OFFER_POWER_TOLERANCE` (15 %, common practice for
 * "far from") below or above it gets a warning: below, the truck may not
 * hold its speed on grade; above, the module may not fit the truck's
 * cooling, mounts and electrical drive without work the offer may not price.
 *
 *   gap = (offer kW − truck kW) / truck kW
 *   warn when |gap| > 0.15
 *
 * Example: a truck on a 2,600 kW engine offered a 2,000 kW module: gap =
 * −600 / 2,600 = −23.1 %, "23 % below". Missing or non-positive ratings
 * give no warning (nothing to compare).
 */
export const OFFER_POWER_TOLERANCE = 0.15;

export type OfferPowerWarning = { gap: number; words: string };

export function offerPowerWarning(truckKw: number | null | undefined, offerKw: number | null | undefined): OfferPowerWarning | null {
  if (!truckKw || !offerKw || truckKw <= 0 || offerKw <= 0 || !Number.isFinite(truckKw) || !Number.isFinite(offerKw)) return null;
  const gap = (offerKw - truckKw) / truckKw;
  if (Math.abs(gap) <= OFFER_POWER_TOLERANCE) return null;
  const pct = Math.round(Math.abs(gap) * 100);
  const kw = (x: number) => `${x.toLocaleString('en-US', { maximumFractionDigits: 0 })} kW`;
  const side = gap < 0 ? 'below' : 'above';
  const risk = gap < 0 ? 'the truck may not hold its speed on grade' : 'cooling, mounts and the drive may need work the offer does not price';
  return { gap, words: `The offer's engine is rated ${kw(offerKw)}, ${pct} % ${side} this truck's ${kw(truckKw)}: ${risk}. Check it with the manufacturer.` };
}
