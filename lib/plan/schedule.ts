/**
 * Months of the swap schedule. Month 0 is the plan's first month ("now",
 * period 0); year y ≥ 1 covers months 12(y−1) .. 12y − 1. The fleet
 * programme (./programme.ts) places each swap; `PlacedSwap` is how a placed
 * swap reads.
 */
export interface PlacedSwap {
  truckId: string;
  dueMonth: number;
  month: number;
  /** placed before its due month */
  movedEarlier: boolean;
  /** placed after its due month (the shop or a budget forced a delay) */
  late: boolean;
}

/** Months from now until an engine reaches its planned life, from its hours and the truck's annual hours. */
export function monthsToLife(engineHours: number, lifeHours: number, annualHours: number): number {
  if (annualHours <= 0) return 0;
  return Math.floor((12 * Math.max(0, lifeHours - engineHours)) / annualHours + 1e-9);
}

/**
 * The month of an engine event from the engine's trace: period 0 is month 0;
 * in year p ≥ 1, after `hourOfYear` of `annualHours`, month 12(p−1) + ⌊12·h/A⌋.
 */
export function monthOfEvent(period: number, hourOfYear: number, annualHours: number): number {
  if (period <= 0) return 0;
  const within = annualHours > 0 ? Math.min(11, Math.floor((12 * hourOfYear) / annualHours + 1e-9)) : 0;
  return 12 * (period - 1) + Math.max(0, within);
}

/** "2027-03" for month index m of a plan starting in `start` ("YYYY-MM"). */
export function monthLabel(start: string, m: number): string {
  const [y, mo] = start.split('-').map(Number);
  const total = y * 12 + (mo - 1) + m;
  return `${Math.floor(total / 12)}-${String((total % 12) + 1).padStart(2, '0')}`;
}
