import { monthLabel, monthsToLife } from '@/lib/plan/schedule';

/**
 * When a truck's engine reaches its planned overhaul, for the fleet register.
 *
 * - Hours to planned overhaul = max(0, planned life of the engine type −
 *   engine hours), in engine hours.
 * - Due month = this month + ⌊12 · hours to overhaul ÷ annual hours⌋ months
 *   (the same rounding as the case's swap schedule, `monthsToLife`); an engine
 *   at or past its planned life is due now.
 * - When the truck's remaining life ends at or before that (remaining life ≤ hours
 *   to overhaul), the overhaul is not due while the truck runs: `due` is null
 *   and `retiresFirst` true.
 *
 * Example: engine type life 18,000 h, engine at 11,800 h, 6,200 h a year,
 * remaining life 20,000 h, this month 2027-01: 6,200 h to overhaul,
 * ⌊12 · 6,200 / 6,200⌋ = 12 months, due 2028-01.
 */
export type OverhaulDue = { hoursToOverhaul: number; monthsAhead: number | null; due: string | null; overdue: boolean; retiresFirst: boolean };

export function overhaulDue(
  truck: { engineHours: number; annualHours: number; remainingLifeHours: number },
  lifeHours: number,
  thisMonth: string,
): OverhaulDue {
  const hoursToOverhaul = Math.max(0, lifeHours - truck.engineHours);
  const overdue = hoursToOverhaul === 0;
  if (!overdue && truck.remainingLifeHours <= hoursToOverhaul) {
    return { hoursToOverhaul, monthsAhead: null, due: null, overdue: false, retiresFirst: true };
  }
  const monthsAhead = monthsToLife(truck.engineHours, lifeHours, truck.annualHours);
  return { hoursToOverhaul, monthsAhead, due: monthLabel(thisMonth, monthsAhead), overdue, retiresFirst: false };
}

/** "2027-01" for a date, in UTC. */
export const monthOf = (d: Date) => `${d.getUTCFullYear()}-${String(d.getUTCMonth() + 1).padStart(2, '0')}`;
