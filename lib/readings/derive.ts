/**
 * The register from readings (issue 20): a truck's engine hours, annual
 * operating hours and measured fuel burn derived from its monthly readings.
 * Pure: no I/O, no clock (the caller passes everything).
 *
 * Readings are end-of-month figures, one per month ("YYYY-MM"): the engine's
 * hour meter M (h), the fuel dispensed in the month F (L), and events.
 *
 * **Window.** For a window of N months ending at the latest reading (month
 * L), the baseline is the last reading in month L − N or earlier; if there is
 * none, the first reading (the window is then shorter, and says so). The
 * window holds the readings after the baseline up to L, and spans
 * `months = L − baseline month` calendar months (gaps count as months).
 *
 * **Operating hours** in the window: H = Σ ΔMᵢ over its readings, where
 * ΔMᵢ = Mᵢ − Mᵢ₋₁, except in a month that records a repower, where the new
 * engine's meter started at zero and ΔMᵢ = Mᵢ (hours the old engine ran that
 * month before the swap are not recorded and are taken as zero).
 *
 * **Annual hours** A = H × 12 / months (h a year).
 *
 * **Measured fuel burn** B = Σ Fᵢ / H over the window's readings (L per
 * operating hour); none when H = 0. The baseline's own fuel is not counted
 * (it was burnt before the window's first hour).
 *
 * **Engine hours** (hours on the current engine since new or last overhaul,
 * as the register means them): after the last recorded repower or overhaul,
 * whichever is later —
 * - repower in month j: M_L (the new engine's meter);
 * - overhaul in month j: M_L − M_{j−1} (the meter before the overhaul month;
 *   the whole of month j counts on the rebuilt engine); when the overhaul is
 *   the first reading, M_L − M_j;
 * - none recorded: M_L, the meter since new (`basis: 'meter'`): the page says
 *   so, since an overhaul before the readings began would not be seen.
 *
 * **Worked example** (also `tests/unit/readings/derive.test.ts`), N = 3:
 *
 * | month   | M (h)  | F (L)   | event    |
 * |---------|--------|---------|----------|
 * | 2025-12 | 10,000 | 250,000 |          |
 * | 2026-01 | 10,500 | 100,000 |          |
 * | 2026-02 | 10,950 |  90,000 | overhaul |
 * | 2026-03 | 11,500 | 110,000 |          |
 *
 * L = 2026-03, baseline = 2025-12 (L − 3), months = 3;
 * H = 500 + 450 + 550 = 1,500 h; A = 1,500 × 12 / 3 = 6,000 h a year;
 * B = (100,000 + 90,000 + 110,000) / 1,500 = 200 L/h;
 * engine hours = 11,500 − 10,500 = 1,000 h since the overhaul of 2026-02.
 */

export type ReadingForDerivation = {
  month: string;
  hourMeter: number;
  fuelLitres: number;
  overhauls: number;
  repowerDate: string | null;
  repowerEngineTypeId: number | null;
};

export type DerivedFigures = {
  /** The latest reading's month: the date of the figures. */
  asOf: string;
  /** Readings used (the baseline excluded) and the span; null with fewer than two readings. */
  window: { from: string; to: string; months: number; askedMonths: number; readings: number } | null;
  operatingHours: number | null;
  litres: number | null;
  annualHours: number | null;
  fuelBurnLitresPerHour: number | null;
  engineHours: { value: number; basis: 'since-overhaul' | 'since-repower' | 'meter'; since: string | null };
  /** The last repower recorded, with the engine fitted (null when not given). */
  repower: { month: string; date: string; engineTypeId: number | null } | null;
};

/** Months from a to b ("YYYY-MM"), b later: whole calendar months. */
export function monthsBetween(a: string, b: string): number {
  return (Number(b.slice(0, 4)) - Number(a.slice(0, 4))) * 12 + (Number(b.slice(5, 7)) - Number(a.slice(5, 7)));
}

/** The month n months before m ("YYYY-MM"). */
export function monthMinus(m: string, n: number): string {
  const total = Number(m.slice(0, 4)) * 12 + Number(m.slice(5, 7)) - 1 - n;
  return `${String(Math.floor(total / 12)).padStart(4, '0')}-${String((total % 12) + 1).padStart(2, '0')}`;
}

/** Hours run in month i: the meter's rise, or the new meter in a repower month. */
const hoursIn = (r: ReadingForDerivation[], i: number) => (r[i].repowerDate !== null ? r[i].hourMeter : r[i].hourMeter - r[i - 1].hourMeter);

/**
 * Derives the figures from a truck's readings (any order; one per month) over
 * a window of `windowMonths` (≥ 1). Null when there are no readings.
 */
export function deriveFigures(readings: ReadingForDerivation[], windowMonths: number): DerivedFigures | null {
  if (readings.length === 0) return null;
  if (!(Number.isInteger(windowMonths) && windowMonths >= 1)) throw new RangeError('windowMonths must be a whole number of at least 1');
  const r = [...readings].sort((a, b) => (a.month < b.month ? -1 : a.month > b.month ? 1 : 0));
  const last = r.length - 1;
  const latest = r[last];

  let window: DerivedFigures['window'] = null;
  let operatingHours: number | null = null;
  let litres: number | null = null;
  let annualHours: number | null = null;
  let burn: number | null = null;
  if (r.length >= 2) {
    const cutoff = monthMinus(latest.month, windowMonths);
    let base = 0;
    for (let i = 0; i < last; i++) if (r[i].month <= cutoff) base = i;
    let h = 0;
    let f = 0;
    for (let i = base + 1; i <= last; i++) {
      h += hoursIn(r, i);
      f += r[i].fuelLitres;
    }
    const months = monthsBetween(r[base].month, latest.month);
    window = { from: monthMinus(r[base].month, -1), to: latest.month, months, askedMonths: windowMonths, readings: last - base };
    operatingHours = h;
    litres = f;
    annualHours = (h * 12) / months;
    burn = h > 0 ? f / h : null;
  }

  let engineHours: DerivedFigures['engineHours'] = { value: latest.hourMeter, basis: 'meter', since: null };
  for (let j = last; j >= 0; j--) {
    if (r[j].repowerDate !== null) {
      engineHours = { value: latest.hourMeter, basis: 'since-repower', since: r[j].month };
      break;
    }
    if (r[j].overhauls > 0) {
      const before = j > 0 ? r[j - 1].hourMeter : r[j].hourMeter;
      engineHours = { value: latest.hourMeter - before, basis: 'since-overhaul', since: r[j].month };
      break;
    }
  }

  let repower: DerivedFigures['repower'] = null;
  for (let j = last; j >= 0; j--) {
    if (r[j].repowerDate !== null) {
      repower = { month: r[j].month, date: r[j].repowerDate!, engineTypeId: r[j].repowerEngineTypeId };
      break;
    }
  }

  return { asOf: latest.month, window, operatingHours, litres, annualHours, fuelBurnLitresPerHour: burn, engineHours, repower };
}

/**
 * A reading's meter must not fall from the month before it, except in a
 * month that records a repower. Returns the problem, or null.
 */
export function meterProblem(previous: { month: string; hourMeter: number } | null, current: { hourMeter: number; repowerDate: string | null }): string | null {
  if (!previous || current.repowerDate !== null) return null;
  if (current.hourMeter < previous.hourMeter) {
    return `${current.hourMeter.toLocaleString('en-US')} h is lower than the reading of ${previous.month} (${previous.hourMeter.toLocaleString('en-US')} h); a meter only falls in a month that records a repower`;
  }
  return null;
}
