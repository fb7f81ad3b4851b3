import { describe, expect, it } from 'vitest';
import { fiscalLabelOfMonth, fiscalLabelOfPeriod, fiscalYearOf, periodMonths, periodName } from '@/lib/plan';

// Fiscal years named after the calendar year they end in (common practice: a July–June year ending June 2027 is FY2027).
describe('fiscal years', () => {
  it('a January start makes the fiscal year the calendar year', () => {
    expect(fiscalYearOf(2027, 1, 1)).toBe(2027);
    expect(fiscalYearOf(2027, 12, 1)).toBe(2027);
  });
  it('a July start: January–June 2027 is FY2027, July 2027 starts FY2028', () => {
    expect(fiscalYearOf(2027, 6, 7)).toBe(2027);
    expect(fiscalYearOf(2027, 7, 7)).toBe(2028);
    expect(fiscalLabelOfMonth('2027-03', 3, 7)).toBe('FY2027'); // 2027-06
    expect(fiscalLabelOfMonth('2027-03', 4, 7)).toBe('FY2028'); // 2027-07
  });
  it('labels plan periods by the fiscal year of their first month', () => {
    // plan from 2027-01: period 0 = 2027-01, period 1 = 2027-01…2027-12, period 2 = 2028-01…
    expect(fiscalLabelOfPeriod('2027-01', 0, 1)).toBe('FY2027');
    expect(fiscalLabelOfPeriod('2027-01', 1, 1)).toBe('FY2027');
    expect(fiscalLabelOfPeriod('2027-01', 2, 1)).toBe('FY2028');
    // April start, plan from 2026-11: period 2 starts 2027-11, in FY2028 (April 2027 – March 2028)
    expect(fiscalLabelOfPeriod('2026-11', 2, 4)).toBe('FY2028');
    expect(periodName('2027-01', 0, 1)).toBe('FY2027 (now)');
    expect(periodMonths('2026-11', 2)).toBe('2027-11 – 2028-10');
    expect(periodMonths('2026-11', 0)).toBe('2026-11, now');
  });
  it('crosses the year end of the calendar', () => {
    expect(fiscalLabelOfMonth('2027-12', 1, 1)).toBe('FY2028');
    expect(fiscalLabelOfMonth('2027-12', 1, 10)).toBe('FY2028'); // 2028-01 lies in October 2027 – September 2028
    expect(fiscalLabelOfMonth('2027-12', 0, 10)).toBe('FY2028'); // 2027-12 too
  });
});
