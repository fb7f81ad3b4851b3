/**
 * Tax depreciation schedules (MODEL.md section 6). A schedule lists the
 * amounts D_1, D_2, … of one spend; the engine places D_j in year
 * max(s, 1) + j − 1 for a spend in period s and writes off in year N whatever
 * falls later.
 */
import type { Depreciation } from '@/lib/validation/case';

/**
 * US MACRS GDS, half-year convention: IRS Publication 946, Table A-1, the
 * percentages of basis as printed (n + 1 entries for an n-year class; the IRS
 * rounds them so each column sums to 100). 3-, 5-, 7- and 10-year classes are
 * 200 % declining balance, 15- and 20-year 150 %.
 */
export const MACRS_HALF_YEAR_PERCENT: Readonly<Record<3 | 5 | 7 | 10 | 15 | 20, readonly number[]>> = {
  3: [33.33, 44.45, 14.81, 7.41],
  5: [20.0, 32.0, 19.2, 11.52, 11.52, 5.76],
  7: [14.29, 24.49, 17.49, 12.49, 8.93, 8.92, 8.93, 4.46],
  10: [10.0, 18.0, 14.4, 11.52, 9.22, 7.37, 6.55, 6.55, 6.56, 6.55, 3.28],
  15: [5.0, 9.5, 8.55, 7.7, 6.93, 6.23, 5.9, 5.9, 5.91, 5.9, 5.91, 5.9, 5.91, 5.9, 5.91, 2.95],
  20: [
    3.75, 7.219, 6.677, 6.177, 5.713, 5.285, 4.888, 4.522, 4.462, 4.461, 4.462, 4.461, 4.462, 4.461, 4.462, 4.461,
    4.462, 4.461, 4.462, 4.461, 2.231,
  ],
};

/**
 * MACRS GDS half-year schedule of `amount` over a `years`-year class:
 * D_j = amount · pct_j / 100 with pct from `MACRS_HALF_YEAR_PERCENT`.
 *
 * @example macrsSchedule(100000, 7)[0] // = 14290
 */
export function macrsSchedule(amount: number, years: number): number[] {
  return depreciationSchedule(amount, { method: 'macrs', years: years as 3 | 5 | 7 | 10 | 15 | 20 });
}

/**
 * Straight line: amount / years in each of `years` years.
 *
 * @example straightLineSchedule(1000, 4) // = [250, 250, 250, 250]
 */
export function straightLineSchedule(amount: number, years: number): number[] {
  return depreciationSchedule(amount, { method: 'straight-line', years });
}

/**
 * Declining balance with a switch to straight line:
 * D_j = max(B_{j−1}·factor/n, B_{j−1}/(n − j + 1)), j = 1..n, where B is the
 * basis not yet depreciated (B_0 = amount). The straight-line term takes over
 * once it is larger, and the last year takes all that is left, so the
 * schedule always sums to the amount. No half-year convention.
 *
 * @example decliningBalanceSchedule(1000, 5, 2) // = [400, 240, 144, 108, 108]
 */
export function decliningBalanceSchedule(amount: number, years: number, factor = 2): number[] {
  return depreciationSchedule(amount, { method: 'declining-balance', years, factor });
}

/** Entries in a schedule of the method: 0 under `none`, n + 1 for MACRS (half-year), else n. */
export function scheduleLength(method: Depreciation): number {
  if (method.method === 'none') return 0;
  if (method.method === 'macrs') {
    const table = MACRS_HALF_YEAR_PERCENT[method.years as 3 | 5 | 7 | 10 | 15 | 20];
    if (!table) throw new RangeError(`MACRS: no GDS table for ${method.years} years (3, 5, 7, 10, 15, 20)`);
    return table.length;
  }
  return method.years;
}

/**
 * The schedule D_1, D_2, … of `amount` written into `out`: its first `limit`
 * entries at most (all of them by default); returns how many were written.
 * The one place the methods' formulas live: `depreciationSchedule` copies
 * from it and `addSpendInto` places its entries within the horizon.
 */
export function scheduleInto(amount: number, method: Depreciation, out: { [j: number]: number }, limit = Number.POSITIVE_INFINITY): number {
  const length = Math.max(0, Math.min(scheduleLength(method), limit));
  switch (method.method) {
    case 'none':
      break;
    case 'straight-line':
      for (let j = 0; j < length; j++) out[j] = amount / method.years;
      break;
    case 'declining-balance': {
      const years = method.years;
      const factor = method.factor ?? 2;
      let basis = amount;
      for (let j = 1; j <= length; j++) {
        const d = Math.max((basis * factor) / years, basis / (years - j + 1));
        out[j - 1] = d;
        basis -= d;
      }
      break;
    }
    case 'macrs': {
      const table = MACRS_HALF_YEAR_PERCENT[method.years as 3 | 5 | 7 | 10 | 15 | 20];
      for (let j = 0; j < length; j++) out[j] = (amount * table[j]) / 100;
      break;
    }
  }
  return length;
}

/**
 * A spend of `amount` in period s depreciated onto a horizon of N years:
 * D_j is added to `byPeriod[max(s,1) + j − 1]` for the years up to N, and the
 * basis not yet depreciated by the end of year N is returned as the write-off
 * (MODEL.md section 6). Only the entries that fall within the horizon are
 * computed: the work and memory are O(N) whatever the tax life, so a
 * schedule longer than the horizon is never built. The write-off is
 * (n − k)·amount/n under straight line, the basis B_k left after the k
 * entries placed under declining balance (what the later entries add up to),
 * and the sum of the later table entries under MACRS (at most 21).
 *
 * @example addSpendInto(1000, { method: 'straight-line', years: 4 }, 0, 2, [0, 0, 0]) // = 500 (250 in years 1 and 2)
 */
export function addSpendInto(
  amount: number,
  method: Depreciation,
  spendPeriod: number,
  horizonYears: number,
  byPeriod: { [y: number]: number },
): number {
  if (method.method === 'none') return 0;
  const first = Math.max(spendPeriod, 1);
  const length = scheduleLength(method);
  const placed = Math.max(0, Math.min(length, horizonYears - first + 1));
  switch (method.method) {
    case 'straight-line': {
      const d = amount / method.years;
      for (let j = 0; j < placed; j++) byPeriod[first + j] += d;
      return (length - placed) * d;
    }
    case 'declining-balance': {
      const years = method.years;
      const factor = method.factor ?? 2;
      let basis = amount;
      for (let j = 1; j <= placed; j++) {
        const d = Math.max((basis * factor) / years, basis / (years - j + 1));
        byPeriod[first + j - 1] += d;
        basis -= d;
      }
      return placed === length ? 0 : basis;
    }
    case 'macrs': {
      const table = MACRS_HALF_YEAR_PERCENT[method.years as 3 | 5 | 7 | 10 | 15 | 20];
      let writeOff = 0;
      for (let j = 0; j < length; j++) {
        const d = (amount * table[j]) / 100;
        if (j < placed) byPeriod[first + j] += d;
        else writeOff += d;
      }
      return writeOff;
    }
  }
}

/**
 * Schedule of `amount` under a case's depreciation method (its first `limit`
 * entries when given). `none` gives an empty schedule: no depreciation and no write-off.
 *
 * @example depreciationSchedule(1000, { method: 'straight-line', years: 2 }) // = [500, 500]
 */
export function depreciationSchedule(amount: number, method: Depreciation, limit = Number.POSITIVE_INFINITY): number[] {
  const out = new Array<number>(Math.max(0, Math.min(scheduleLength(method), limit)));
  scheduleInto(amount, method, out, limit);
  return out;
}

/** Where a spend's depreciation falls within a horizon of N years. */
export interface PlacedSchedule {
  /** depreciation by period 0..N (period 0 is always 0), write-off excluded */
  byPeriod: number[];
  /** basis not yet depreciated by the end of year N, written off in year N */
  writeOff: number;
}

/**
 * Place a spend's schedule on the horizon: D_j falls in year max(s,1)+j−1;
 * whatever would fall after year N is written off in year N.
 *
 * @example placeSchedule([500, 500], 0, 1) // = { byPeriod: [0, 500], writeOff: 500 }
 */
export function placeSchedule(schedule: readonly number[], spendPeriod: number, horizonYears: number): PlacedSchedule {
  const byPeriod = new Array<number>(horizonYears + 1).fill(0);
  const writeOff = addScheduleInto(schedule, spendPeriod, horizonYears, byPeriod);
  return { byPeriod, writeOff };
}

/**
 * `placeSchedule` adding into an existing by-period array (each D_j to its
 * own year); returns the spend's write-off, summed on its own from 0 so that
 * it is the same number however the caller totals it.
 */
export function addScheduleInto(
  schedule: ArrayLike<number>,
  spendPeriod: number,
  horizonYears: number,
  byPeriod: { [y: number]: number },
  length = schedule.length,
): number {
  let writeOff = 0;
  const first = Math.max(spendPeriod, 1);
  for (let j = 0; j < length; j++) {
    const year = first + j;
    if (year <= horizonYears) byPeriod[year] += schedule[j];
    else writeOff += schedule[j];
  }
  return writeOff;
}

/**
 * Whether a spend is depreciated for tax: a repower always, an overhaul or a
 * repair only when rebuilds are capitalised; never a spend of 0 (MODEL.md section 6).
 */
export function isDepreciatedSpend(repower: boolean, cost: number, expense: boolean): boolean {
  if (cost === 0) return false;
  return repower || !expense;
}
