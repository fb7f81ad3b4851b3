import { describe, expect, it } from 'vitest';
import { monthLabel, monthOfEvent, monthsToLife, scheduleSwaps } from '@/lib/plan';

describe('swap schedule', () => {
  it('puts each swap in the month its engine reaches life', () => {
    // 20,000 h life, 14,000 h run, 6,000 h a year: 1 year to go = month 12.
    expect(monthsToLife(14_000, 20_000, 6_000)).toBe(12);
    expect(monthsToLife(21_000, 20_000, 6_000)).toBe(0);
    // Half way through year 2 (3,000 of 6,000 h) is month 12 + 6.
    expect(monthOfEvent(2, 3_000, 6_000)).toBe(18);
    expect(monthOfEvent(0, 0, 6_000)).toBe(0);
    expect(monthOfEvent(1, 6_000, 6_000)).toBe(11);
    const s = scheduleSwaps([{ truckId: 'A', dueMonth: 5, gain: 1 }, { truckId: 'B', dueMonth: 9, gain: 1 }], 1);
    expect(s.map((x) => [x.truckId, x.month, x.movedEarlier])).toEqual([['A', 5, false], ['B', 9, false]]);
  });

  it('moves an excess swap to the nearest earlier month with room and flags it', () => {
    const s = scheduleSwaps(
      [
        { truckId: 'A', dueMonth: 6, gain: 3 },
        { truckId: 'B', dueMonth: 6, gain: 2 },
        { truckId: 'C', dueMonth: 6, gain: 1 },
        { truckId: 'D', dueMonth: 5, gain: 1 },
      ],
      1,
    );
    const at = Object.fromEntries(s.map((x) => [x.truckId, x]));
    expect(at.A).toMatchObject({ month: 6, movedEarlier: false }); // largest gain keeps its month
    expect(at.D).toMatchObject({ month: 5, movedEarlier: false });
    expect(at.B).toMatchObject({ month: 4, movedEarlier: true });
    expect(at.C).toMatchObject({ month: 3, movedEarlier: true });
    // never more than the capacity in a month
    expect(new Set(s.map((x) => x.month)).size).toBe(4);
  });

  it('places a swap late and flags it when no earlier month has room', () => {
    const s = scheduleSwaps(
      [
        { truckId: 'A', dueMonth: 0, gain: 2 },
        { truckId: 'B', dueMonth: 0, gain: 1 },
        { truckId: 'C', dueMonth: 1, gain: 1 },
      ],
      1,
    );
    // B finds no room in or before month 0 and takes month 1; C, due in month 1, then finds month 0 and 1 full.
    expect(s.find((x) => x.truckId === 'B')).toMatchObject({ month: 1, late: true, movedEarlier: false });
    expect(s.find((x) => x.truckId === 'C')).toMatchObject({ month: 2, late: true });
  });

  it('names months from the plan start', () => {
    expect(monthLabel('2027-01', 0)).toBe('2027-01');
    expect(monthLabel('2027-11', 3)).toBe('2028-02');
  });
});
