import { describe, expect, it } from 'vitest';
import { offerPowerFit } from '@/lib/fleet/offer-power';

// Thresholds: common practice for a like-for-like repower (15 % below, 25 % above); figures worked by hand.
describe('offerPowerFit', () => {
  it('warns for a 2,000 kW module on a 2,600 kW truck (23 % below)', () => {
    const f = offerPowerFit(2600, 2000);
    expect(f.kind).toBe('below');
    expect(f.kind !== 'fits' && f.percent).toBe(23);
    expect(f.kind !== 'fits' && f.message).toMatch(/^The offer's engine is rated 2,000 kW, 23 % below the truck's 2,600 kW engine/);
  });
  it('accepts up to 15 % below and 25 % above', () => {
    expect(offerPowerFit(2000, 1700).kind).toBe('fits'); // exactly 15 % below
    expect(offerPowerFit(2000, 2500).kind).toBe('fits'); // exactly 25 % above
    expect(offerPowerFit(1600, 1700).kind).toBe('fits');
  });
  it('warns above 25 %', () => {
    const f = offerPowerFit(1600, 2100); // 31 % above
    expect(f.kind).toBe('above');
    expect(f.kind !== 'fits' && f.percent).toBe(31);
  });
  it('says nothing without both powers', () => {
    expect(offerPowerFit(0, 2000).kind).toBe('fits');
    expect(offerPowerFit(2000, Number.NaN).kind).toBe('fits');
  });
});
