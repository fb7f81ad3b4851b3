/**
 * The realistic default ranges (lib/engine/sensitivity/ranges.ts): one per driver, documented, inside the
 * driver's valid limits (which are the case file's `ranged()` limits: drivers.test checks that), with an
 * absolute range for drivers whose value in a case is often 0. Expected figures are the documented ranges.
 */
import { describe, expect, it } from 'vitest';
import { DEFAULT_RANGES, DRIVER_CATALOGUE, DRIVER_KEYS, realisticRange, uniformRange, ZERO_BASE_DRIVERS, defaultBreakEvenRange, type DriverKey } from '@/lib/engine/sensitivity';

describe('the realistic range table', () => {
  it.each(DRIVER_KEYS)('gives %s a documented range with its source marked', (key) => {
    const r = DEFAULT_RANGES[key];
    expect(r).toBeDefined();
    expect(r.source.trim().length).toBeGreaterThan(10);
    expect(r.source).toMatch(/^(common practice|from memory):/);
    expect(r.low).toBeLessThan(0);
    expect(r.high).toBeGreaterThanOrEqual(0);
  });

  it('has no entry for a driver that does not exist', () => {
    expect(Object.keys(DEFAULT_RANGES).sort()).toEqual([...DRIVER_KEYS].sort());
  });

  it.each(DRIVER_KEYS)('keeps %s inside its valid limits, at bases across the limits and at 0', (key: DriverKey) => {
    const { min, max } = DRIVER_CATALOGUE[key];
    const top = Math.min(max, 1e6);
    for (const base of [min, (min + top) / 2, top, 0]) {
      const [lo, hi] = realisticRange({ key, target: 'x' }, base);
      expect(lo).toBeGreaterThanOrEqual(min);
      expect(hi).toBeLessThanOrEqual(max);
      expect(lo).toBeLessThanOrEqual(hi);
    }
  });

  it('gives the zero-base drivers an absolute range (carbon price 0 to 200 per t CO2, productivity gain 0 to 5 %)', () => {
    expect(ZERO_BASE_DRIVERS).toEqual(expect.arrayContaining(['carbonPrice', 'productivityGain']));
    expect(realisticRange({ key: 'carbonPrice' }, 0)).toEqual([0, 200]);
    expect(uniformRange({ key: 'carbonPrice' }, 0, 0.2)).toEqual([0, 200]);
    expect(realisticRange({ key: 'productivityGain', target: 'o' }, 0)).toEqual([0, 0.05]);
    for (const key of ZERO_BASE_DRIVERS) {
      const [lo, hi] = realisticRange({ key, target: 'x' }, 0);
      expect(hi).toBeGreaterThan(lo);
    }
  });

  it('searches the break-even of a zero-base driver over its absolute range, not 0 to 1', () => {
    expect(defaultBreakEvenRange({ key: 'carbonPrice' }, 0)).toEqual([0, 200]);
    // other drivers keep the documented rule: 0 to 3× the base
    expect(defaultBreakEvenRange({ key: 'fuelPrice' }, 1.2)[1]).toBeCloseTo(3.6, 12);
  });

  it('reads the documented figures: BSFC −3/+5 % (from memory: 195–215 g/kWh at rated load), discount rate ±3 points', () => {
    const [lo, hi] = realisticRange({ key: 'bsfcGPerKwh', target: 'e' }, 200);
    expect(lo).toBeCloseTo(194, 9);
    expect(hi).toBeCloseTo(210, 9);
    const [dlo, dhi] = realisticRange({ key: 'discountRate' }, 0.08);
    expect(dlo).toBeCloseTo(0.05, 12);
    expect(dhi).toBeCloseTo(0.11, 12);
  });

  it('clips to the limits: a share of lost margin of 1 goes no higher than 1', () => {
    expect(realisticRange({ key: 'lostMarginShare' }, 1)).toEqual([0.75, 1]);
  });
});
