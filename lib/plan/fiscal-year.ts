/**
 * Fiscal years. A workspace says in which calendar month its fiscal year
 * starts (1 = January, the default). A fiscal year is named after the
 * calendar year in which it ends: with a July start, July 2026 – June 2027 is
 * "FY2027"; with a January start FY2027 is the calendar year 2027.
 *
 * The plan counts months from its first month ("YYYY-MM", month 0). A plan
 * period (the engine's year of spend) p ≥ 1 covers months 12(p − 1) … 12p − 1
 * and period 0 is month 0 ("now"); a period is labelled by the fiscal year of
 * its first month. When the fiscal year does not start in the plan's first
 * calendar month a period runs into the next fiscal year: `periodMonths` says
 * which months it covers.
 */

/** The fiscal year (the calendar year it ends in) of a calendar month. */
export function fiscalYearOf(calendarYear: number, calendarMonth: number, startMonth = 1): number {
  return startMonth > 1 && calendarMonth >= startMonth ? calendarYear + 1 : calendarYear;
}

/** Calendar year and month (1..12) of month index m of a plan starting in `planStart` ("YYYY-MM"). */
export function calendarMonthOf(planStart: string, m: number): { year: number; month: number } {
  const [y, mo] = planStart.split('-').map(Number);
  const total = y * 12 + (mo - 1) + m;
  return { year: Math.floor(total / 12), month: (total % 12) + 1 };
}

/** "FY2027" for month index m of the plan. */
export function fiscalLabelOfMonth(planStart: string, m: number, startMonth = 1): string {
  const c = calendarMonthOf(planStart, m);
  return `FY${fiscalYearOf(c.year, c.month, startMonth)}`;
}

/** First month index of a plan period (0 for period 0 and period 1). */
export function periodFirstMonth(period: number): number {
  return period <= 0 ? 0 : 12 * (period - 1);
}

/** "FY2027" for a plan period (year of spend): the fiscal year of its first month. */
export function fiscalLabelOfPeriod(planStart: string, period: number, startMonth = 1): string {
  return fiscalLabelOfMonth(planStart, periodFirstMonth(period), startMonth);
}

/** "2027-01 – 2027-12" (period 0: "2027-01, now"): the months a plan period covers. */
export function periodMonths(planStart: string, period: number): string {
  const fmt = (m: number) => {
    const c = calendarMonthOf(planStart, m);
    return `${c.year}-${String(c.month).padStart(2, '0')}`;
  };
  if (period <= 0) return `${fmt(0)}, now`;
  return `${fmt(12 * (period - 1))} – ${fmt(12 * period - 1)}`;
}

/** A period's name in plan tables: "FY2027 (now)" for period 0, else "FY2027". */
export function periodName(planStart: string, period: number, startMonth = 1): string {
  const fy = fiscalLabelOfPeriod(planStart, period, startMonth);
  return period <= 0 ? `${fy} (now)` : fy;
}

export const MONTH_NAMES = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'] as const;
