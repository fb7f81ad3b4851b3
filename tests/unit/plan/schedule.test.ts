import { describe, expect, it } from 'vitest';
import { monthLabel, monthOfEvent, monthsToLife } from '@/lib/plan';

describe('swap schedule months', () => {
  it('counts the months to an engine\'s life and the month of an event', () => {
    // 20,000 h life, 14,000 h run, 6,000 h a year: 1 year to go = month 12.
    expect(monthsToLife(14_000, 20_000, 6_000)).toBe(12);
    expect(monthsToLife(21_000, 20_000, 6_000)).toBe(0);
    // Half way through year 2 (3,000 of 6,000 h) is month 12 + 6.
    expect(monthOfEvent(2, 3_000, 6_000)).toBe(18);
    expect(monthOfEvent(0, 0, 6_000)).toBe(0);
    expect(monthOfEvent(1, 6_000, 6_000)).toBe(11);
  });

  it('names months from the plan start', () => {
    expect(monthLabel('2027-01', 0)).toBe('2027-01');
    expect(monthLabel('2027-11', 3)).toBe('2028-02');
  });
});
