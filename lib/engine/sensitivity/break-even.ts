/**
 * Break-even: for each driver, the value at which a Δnpv metric crosses zero
 * (the repower stops paying, or starts to), found by scanning the range for a
 * sign change and refining it with the bracketing root finder.
 */
import { clampDriver, DRIVER_CATALOGUE, driverId, getDriver, type DriverRef } from './drivers';
import type { Evaluator } from './metric';
import { DEFAULT_RANGES } from './ranges';
import { findRoot } from './root';

export type BreakEvenKind =
  /** Δnpv = 0 at `value` (to 1e-6) */
  | 'crossing'
  /** Δnpv jumps across zero at `value` (an event moves in or out of the horizon), no exact zero */
  | 'step'
  /** no sign change within the range */
  | 'none';

export interface BreakEven {
  driver: string;
  base: number;
  rangeLow: number;
  rangeHigh: number;
  kind: BreakEvenKind;
  value: number | null;
  /** Δnpv at the base value: > 0 the repower pays now */
  baseMetric: number;
  /** with kind none: the sign of Δnpv over the whole range (1 pays throughout, −1 loses throughout) */
  signThroughout: number | null;
}

const SCAN_STEPS = 16;

/**
 * The default search range: rates within −20/+30 points of the base, other figures from 0 to 3× the base;
 * where the base is 0, the driver's absolute zero-base range (ranges.ts: carbon price 0 to 200 per t CO2,
 * productivity gain 0 to 5 %), else 0 to 1.
 */
export function defaultBreakEvenRange(d: DriverRef, base: number): [number, number] {
  const info = DRIVER_CATALOGUE[d.key];
  const zero = DEFAULT_RANGES[d.key].zero;
  if (base === 0 && zero) return [clampDriver(d, zero[0]), clampDriver(d, zero[1])];
  if (info.unit.includes('%')) return [clampDriver(d, base - 0.2), clampDriver(d, base + 0.3)];
  return [clampDriver(d, 0), clampDriver(d, base === 0 ? 1 : 3 * base)];
}

/**
 * Break-even value of one driver. Of several sign changes in the range, the
 * one nearest the base value is reported.
 */
export function breakEven(ev: Evaluator, d: DriverRef, range?: readonly [number, number]): BreakEven {
  const base = getDriver(ev.base, d);
  const [lo, hi] = range ? [clampDriver(d, range[0]), clampDriver(d, range[1])] : defaultBreakEvenRange(d, base);
  const f = (x: number) => ev.at([[d, x]]);
  const xs: number[] = [];
  for (let i = 0; i <= SCAN_STEPS; i++) xs.push(lo + ((hi - lo) * i) / SCAN_STEPS);
  // the base itself is a scan point, so a crossing right beside it is not stepped over
  if (base > lo && base < hi) xs.push(base);
  xs.sort((a, b) => a - b);
  const fs = xs.map((x) => (x === base ? ev.baseValue : f(x)));
  const out = { driver: driverId(d), base, rangeLow: lo, rangeHigh: hi, baseMetric: ev.baseValue };
  let bestBracket: [number, number] | null = null;
  for (let i = 0; i < xs.length; i++) {
    let bracket: [number, number] | null = null;
    if (fs[i] === 0) bracket = [i, i];
    else if (i + 1 < xs.length && fs[i + 1] !== 0 && Math.sign(fs[i]) !== Math.sign(fs[i + 1])) bracket = [i, i + 1];
    if (!bracket) continue;
    const mid = (xs[bracket[0]] + xs[bracket[1]]) / 2;
    if (!bestBracket || Math.abs(mid - base) < Math.abs((xs[bestBracket[0]] + xs[bestBracket[1]]) / 2 - base)) bestBracket = bracket;
  }
  if (!bestBracket) return { ...out, kind: 'none', value: null, signThroughout: Math.sign(fs[0]) };
  const [i, j] = bestBracket;
  if (i === j) return { ...out, kind: 'crossing', value: xs[i], signThroughout: null };
  // the expected valuation is accurate to about 1e-5 of an npv (MODEL.md section 11): locating its root to the
  // last bit of the driver would only chase the grid's rounding, so it stops at 1e-9 of the driver
  const xTol = ev.base.assumptions.valuation === 'median-path' ? 1e-14 : 1e-9;
  const root = findRoot(f, xs[i], xs[j], fs[i], fs[j], 1e-9, xTol);
  const kind = Math.abs(root.fx) <= 1e-6 ? 'crossing' : 'step';
  return { ...out, kind, value: root.x, signThroughout: null };
}

export function breakEvens(ev: Evaluator, drivers: readonly DriverRef[], ranges: Readonly<Record<string, readonly [number, number]>> = {}): BreakEven[] {
  return drivers.map((d) => breakEven(ev, d, ranges[driverId(d)]));
}
