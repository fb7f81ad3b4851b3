/**
 * The swap schedule: each chosen repower placed in the month its engine is
 * due, at most `perMonth` swaps a month (shop capacity). Month 0 is the
 * plan's first month ("now", period 0); year y ≥ 1 covers months
 * 12(y−1) .. 12y − 1.
 *
 * Months are filled in order. Within a month the larger gains keep their due
 * month; an excess swap moves to the nearest earlier month with room (an
 * engine swapped early loses only some unused hours; one swapped late runs
 * past its life) and is flagged. When no earlier month has room it goes to
 * the nearest later month with room, flagged as late.
 */
export interface SwapRequest {
  truckId: string;
  dueMonth: number;
  gain: number;
}

export interface PlacedSwap {
  truckId: string;
  dueMonth: number;
  month: number;
  /** moved earlier than due for lack of shop capacity */
  movedEarlier: boolean;
  /** no earlier month had room: placed after its due month */
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

/** Hours within which two times count as one (MODEL.md's ε on hours; an event within it of a year's end is booked in that year). */
const HOUR_TOLERANCE = 1e-6;

/**
 * The period and month of a planned engine event `hoursToEvent` hours from
 * now (e.g. a planned repower: lifeHours − engineHours, when no failure comes
 * first), booked as MODEL.md section 3 books events: 0 or less (an engine at
 * or past its life, a repower now) is period 0, month 0; otherwise the year y
 * whose hours ((y−1)·A, y·A] hold it, the year's last hour included, at
 * `monthOfEvent(y, hoursToEvent − (y−1)·A, A)`. An event at or after the
 * horizon's last hour (`horizonHours` = min(remaining life, N·A)) does not
 * happen: null. Timing (end-of-year or mid-year) moves discounting only, not
 * the period an event is booked in.
 *
 * @example plannedEventMonth(20_000 − 12_600, 6_050, 60_000) // { period: 2, month: 14 }: 1,350 h into year 2
 */
export function plannedEventMonth(hoursToEvent: number, annualHours: number, horizonHours: number): { period: number; month: number } | null {
  if (hoursToEvent <= HOUR_TOLERANCE) return { period: 0, month: 0 };
  if (hoursToEvent >= horizonHours - HOUR_TOLERANCE || !(annualHours > 0)) return null;
  const period = Math.max(1, Math.ceil((hoursToEvent - HOUR_TOLERANCE) / annualHours));
  return { period, month: monthOfEvent(period, hoursToEvent - (period - 1) * annualHours, annualHours) };
}

export function scheduleSwaps(requests: SwapRequest[], perMonth: number): PlacedSwap[] {
  const cap = Math.max(1, Math.floor(perMonth));
  const load = new Map<number, number>();
  const room = (m: number) => (load.get(m) ?? 0) < cap;
  const order = [...requests].sort((a, b) => a.dueMonth - b.dueMonth || b.gain - a.gain || a.truckId.localeCompare(b.truckId));
  const placed: PlacedSwap[] = [];
  for (const r of order) {
    const due = Math.max(0, Math.floor(r.dueMonth));
    let month = due;
    if (!room(month)) {
      month = -1;
      for (let m = due - 1; m >= 0; m--) if (room(m)) { month = m; break; }
      if (month < 0) for (month = due + 1; !room(month); month++);
    }
    load.set(month, (load.get(month) ?? 0) + 1);
    placed.push({ truckId: r.truckId, dueMonth: due, month, movedEarlier: month < due, late: month > due });
  }
  return placed.sort((a, b) => a.month - b.month || a.truckId.localeCompare(b.truckId));
}

/** "2027-03" for month index m of a plan starting in `start` ("YYYY-MM"). */
export function monthLabel(start: string, m: number): string {
  const [y, mo] = start.split('-').map(Number);
  const total = y * 12 + (mo - 1) + m;
  return `${Math.floor(total / 12)}-${String((total % 12) + 1).padStart(2, '0')}`;
}
