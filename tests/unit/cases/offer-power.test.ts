import { describe, expect, it } from 'vitest';
import { OFFER_POWER_TOLERANCE, offerPowerWarning } from '@/lib/cases/offer-power';

// Tolerance of 15 % between the offered engine's rating and the truck's own: common practice, not a published figure.
describe('offerPowerWarning', () => {
  it('warns on the doc comment\'s worked example: 2,000 kW offered to a 2,600 kW truck is 23 % below', () => {
    const w = offerPowerWarning(2600, 2000)!;
    expect(w.gap).toBeCloseTo(-600 / 2600, 12);
    expect(w.words).toContain('2,000 kW, 23 % below this truck\'s 2,600 kW');
  });
  it('warns above as well, rounding the share', () => {
    expect(offerPowerWarning(1900, 2700)!.words).toContain('42 % above');
  });
  it('is quiet within the tolerance, at its edge, and with nothing to compare', () => {
    expect(offerPowerWarning(2000, 2000 * (1 + OFFER_POWER_TOLERANCE))).toBeNull();
    expect(offerPowerWarning(2000, 2000 * (1 - OFFER_POWER_TOLERANCE))).toBeNull();
    expect(offerPowerWarning(2000, 2100)).toBeNull();
    expect(offerPowerWarning(null, 2000)).toBeNull();
    expect(offerPowerWarning(2000, undefined)).toBeNull();
    expect(offerPowerWarning(0, 2000)).toBeNull();
    expect(offerPowerWarning(2000, Number.NaN)).toBeNull();
  });
  it('warns just past the edge', () => {
    expect(offerPowerWarning(2000, 2000 * (1 + OFFER_POWER_TOLERANCE) + 1)).not.toBeNull();
  });
});
