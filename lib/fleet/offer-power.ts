/**
 * Does a repower offer's engine fit the truck's engine? Pure.
 *
 * A module much weaker than the engine it replaces cannot give the truck the
 * power its haul cycle was sized for (slower on grade, longer cycles); a much
 * stronger one may exceed what the drivetrain, cooling and mounts were built
 * for. The thresholds are common practice for a like-for-like repower, not a
 * manufacturer's rule: warn when the offer's rated power is more than 15 %
 * below or more than 25 % above the truck's engine rated power.
 *
 * ratio = offerKw / truckKw; below when ratio < 0.85, above when ratio > 1.25.
 * Worked example: truck engine 2,600 kW, module 2,000 kW → ratio 0.769,
 * 23 % below → warning "23 % below".
 */
export const POWER_BELOW = 0.15;
export const POWER_ABOVE = 0.25;

export type PowerFit = { kind: 'fits' } | { kind: 'below' | 'above'; percent: number; message: string };

export function offerPowerFit(truckKw: number, offerKw: number): PowerFit {
  if (!(truckKw > 0) || !(offerKw > 0)) return { kind: 'fits' };
  const ratio = offerKw / truckKw;
  const fmt = (x: number) => new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 }).format(x);
  if (ratio < 1 - POWER_BELOW) {
    const percent = Math.round((1 - ratio) * 100);
    return { kind: 'below', percent, message: `The offer's engine is rated ${fmt(offerKw)} kW, ${percent} % below the truck's ${fmt(truckKw)} kW engine (more than ${POWER_BELOW * 100} % below): it may not give the truck the power its haul was sized for. Check with the manufacturer before choosing it.` };
  }
  if (ratio > 1 + POWER_ABOVE) {
    const percent = Math.round((ratio - 1) * 100);
    return { kind: 'above', percent, message: `The offer's engine is rated ${fmt(offerKw)} kW, ${percent} % above the truck's ${fmt(truckKw)} kW engine (more than ${POWER_ABOVE * 100} % above): the drivetrain, cooling and mounts may not be rated for it. Check with the manufacturer before choosing it.` };
  }
  return { kind: 'fits' };
}
