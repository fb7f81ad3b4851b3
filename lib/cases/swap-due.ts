/**
 * When a chosen repower is due: the period its capital is planned in and the
 * month of the swap (MODEL.md section 3 for the booking, section 11 for the
 * valuations). Pure.
 *
 * - Median path: the repower on the truck's traced path (at the planned life,
 *   or at the median failure age when that comes first), which is where its
 *   capital is booked.
 * - Expected valuation: there is no traced path; the repower is planned for
 *   the hour the current engine reaches its planned life with no failure
 *   before it (`plannedEventMonth` of lifeHours − engineHours), or now
 *   (timing "now", or an engine at or past its life). Its capital is then
 *   planned in that period — the expected spend is spread over the years
 *   (a failure can bring the swap forward), but the planned swap is what a
 *   budget and the shop schedule hold. When the planned life lies beyond the
 *   horizon, the swap happens only if the engine fails first: it is due at the
 *   start of the first period with expected spend (`fallbackPeriod`).
 */
import { monthOfEvent, plannedEventMonth } from '@/lib/plan';
import type { TimelineEvent } from './types';

export interface DueInput {
  valuation: 'expected' | 'median-path';
  engineHours: number;
  annualHours: number;
  remainingLifeHours: number;
  /** the current engine's planned life, hours */
  lifeHours: number;
  timing: 'at-overhaul' | 'now';
  /** N, the truck's horizon in years */
  horizonYears: number;
  /** the repower on the traced path (median path) */
  traced?: Pick<TimelineEvent, 'period' | 'month'>;
  /** first period with repower capital in the result (the ranking's), null when none */
  fallbackPeriod: number | null;
}

export function repowerDue(d: DueInput): { period: number; month: number } | null {
  const atMonthZeroOf = (p: number | null) => (p === null ? null : { period: p, month: monthOfEvent(p, 0, d.annualHours) });
  if (d.valuation === 'median-path') return d.traced ? { period: d.traced.period, month: d.traced.month } : atMonthZeroOf(d.fallbackPeriod);
  const toLife = d.timing === 'now' ? 0 : d.lifeHours - d.engineHours;
  const horizon = Math.min(d.remainingLifeHours, d.horizonYears * d.annualHours);
  return plannedEventMonth(toLife, d.annualHours, horizon) ?? atMonthZeroOf(d.fallbackPeriod);
}
