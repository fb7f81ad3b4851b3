import { describe, expect, it } from 'vitest';
import { monthOf, overhaulDue } from '@/lib/overhaul-due';

// Expected values worked by hand from the definition (hours = life − engine hours; months = ⌊12·hours/annual⌋).
describe('overhaulDue', () => {
  it('the worked example: 18,000 h life, 11,800 h on the engine, 6,200 h a year → 6,200 h, 12 months, due a year on', () => {
    expect(overhaulDue({ engineHours: 11800, annualHours: 6200, remainingLifeHours: 20000 }, 18000, '2027-01')).toEqual({
      hoursToOverhaul: 6200, monthsAhead: 12, due: '2028-01', overdue: false, retiresFirst: false,
    });
  });

  it('rounds down to whole months and carries into the next year', () => {
    // 3,000 h at 6,000 h a year = 6 months; from 2027-09 that is 2028-03
    expect(overhaulDue({ engineHours: 15000, annualHours: 6000, remainingLifeHours: 40000 }, 18000, '2027-09').due).toBe('2028-03');
    // 2,999 h at 6,000 h a year = 5.998 months → 5
    expect(overhaulDue({ engineHours: 15001, annualHours: 6000, remainingLifeHours: 40000 }, 18000, '2027-09').monthsAhead).toBe(5);
  });

  it('an engine at or past its planned life is due now, with 0 hours to go', () => {
    expect(overhaulDue({ engineHours: 19000, annualHours: 6000, remainingLifeHours: 100 }, 18000, '2027-01')).toEqual({
      hoursToOverhaul: 0, monthsAhead: 0, due: '2027-01', overdue: true, retiresFirst: false,
    });
  });

  it('a truck whose remaining life ends first has no due month', () => {
    const d = overhaulDue({ engineHours: 10000, annualHours: 6000, remainingLifeHours: 8000 }, 18000, '2027-01');
    expect(d).toEqual({ hoursToOverhaul: 8000, monthsAhead: null, due: null, overdue: false, retiresFirst: true });
  });

  it('names the month of a date in UTC', () => {
    expect(monthOf(new Date('2026-12-31T23:59:59Z'))).toBe('2026-12');
    expect(monthOf(new Date('2027-01-01T00:00:00Z'))).toBe('2027-01');
  });
});
