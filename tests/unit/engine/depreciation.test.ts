/**
 * Depreciation schedules. MACRS percentages are the printed IRS table
 * (shared/CHECKS.md), not a recomputation.
 */
import { describe, expect, it } from 'vitest';
import {
  MACRS_HALF_YEAR_PERCENT,
  decliningBalanceSchedule,
  depreciationSchedule,
  macrsSchedule,
  placeSchedule,
  straightLineSchedule,
} from '@/lib/engine';

describe('MACRS GDS half-year tables', () => {
  it('3-, 5- and 7-year columns are those printed in IRS Publication 946, Table A-1', () => {
    // IRS Publication 946, Table A-1 (half-year convention), as quoted in shared/CHECKS.md
    expect(MACRS_HALF_YEAR_PERCENT[3]).toEqual([33.33, 44.45, 14.81, 7.41]);
    expect(MACRS_HALF_YEAR_PERCENT[5]).toEqual([20.0, 32.0, 19.2, 11.52, 11.52, 5.76]);
    expect(MACRS_HALF_YEAR_PERCENT[7]).toEqual([14.29, 24.49, 17.49, 12.49, 8.93, 8.92, 8.93, 4.46]);
  });

  it('10-, 15- and 20-year columns start and end as printed in Table A-1', () => {
    // IRS Publication 946, Table A-1 (from memory of the printed table): first and last entries
    expect(MACRS_HALF_YEAR_PERCENT[10].slice(0, 3)).toEqual([10.0, 18.0, 14.4]);
    expect(MACRS_HALF_YEAR_PERCENT[10].at(-1)).toBe(3.28);
    expect(MACRS_HALF_YEAR_PERCENT[15].slice(0, 3)).toEqual([5.0, 9.5, 8.55]);
    expect(MACRS_HALF_YEAR_PERCENT[15].at(-1)).toBe(2.95);
    expect(MACRS_HALF_YEAR_PERCENT[20].slice(0, 3)).toEqual([3.75, 7.219, 6.677]);
    expect(MACRS_HALF_YEAR_PERCENT[20].at(-1)).toBe(2.231);
  });

  it('each column has n + 1 entries summing to 100 (the IRS rounds so they do)', () => {
    for (const n of [3, 5, 7, 10, 15, 20] as const) {
      const column = MACRS_HALF_YEAR_PERCENT[n];
      expect(column).toHaveLength(n + 1);
      expect(column.reduce((s, p) => s + p, 0)).toBeCloseTo(100, 9);
    }
  });

  it('macrsSchedule applies the percentages to the basis', () => {
    // 7-year class, year 1: 14.29 % of 100,000 = 14,290
    expect(macrsSchedule(100000, 7)[0]).toBeCloseTo(14290, 9);
    expect(() => macrsSchedule(1000, 4)).toThrow(RangeError);
  });
});

describe('straight line and declining balance', () => {
  it('straight line spreads the amount evenly', () => {
    expect(straightLineSchedule(1000, 4)).toEqual([250, 250, 250, 250]);
  });

  it('declining balance switches to straight line when that is larger (the switch)', () => {
    // 200 % DB, 5 years, 1000: 400, 240, 144; then B/(n−j+1) = 216/2 = 108 beats 216·0.4 = 86.4; then 108
    const d = decliningBalanceSchedule(1000, 5, 2);
    expect(d[0]).toBeCloseTo(400, 9);
    expect(d[1]).toBeCloseTo(240, 9);
    expect(d[2]).toBeCloseTo(144, 9);
    expect(d[3]).toBeCloseTo(108, 9);
    expect(d[4]).toBeCloseTo(108, 9);
  });

  it('150 % declining balance over 4 years also sums to the amount', () => {
    // j1: max(1000·1.5/4 = 375, 250) = 375; j2: max(625·0.375 = 234.375, 625/3 = 208.33) = 234.375;
    // j3: max(390.625·0.375 = 146.48, 390.625/2 = 195.3125) = 195.3125; j4: 195.3125
    const d = decliningBalanceSchedule(1000, 4, 1.5);
    expect(d).toEqual([375, 234.375, 195.3125, 195.3125]);
  });

  it('method none has no schedule at all', () => {
    expect(depreciationSchedule(1000, { method: 'none' })).toEqual([]);
  });
});

describe('placing a schedule on the horizon', () => {
  it('puts D_j in year max(s,1)+j−1 and writes off what falls after year N', () => {
    // spend in period 1, straight line 5 years, N = 3: years 1..3 get 200 each, 400 written off in year 3
    const placed = placeSchedule([200, 200, 200, 200, 200], 1, 3);
    expect(placed.byPeriod).toEqual([0, 200, 200, 200]);
    expect(placed.writeOff).toBe(400);
  });

  it('starts a period-0 spend in year 1', () => {
    expect(placeSchedule([500, 500], 0, 2)).toEqual({ byPeriod: [0, 500, 500], writeOff: 0 });
  });
});
