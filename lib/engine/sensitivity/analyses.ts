/**
 * Tornado, spider and two-way table over the drivers of a case.
 * Each figure is the metric re-run by the engine with the driver(s) changed;
 * nothing is interpolated.
 */
import { clampDriver, driverId, getDriver, type DriverRef } from './drivers';
import type { Evaluator } from './metric';
import { realisticRange, uniformRange } from './ranges';

export interface TornadoRow {
  driver: string;
  base: number;
  low: number;
  high: number;
  metricLow: number;
  metricHigh: number;
  /** |metricHigh − metricLow| */
  swing: number;
}

/**
 * Tornado: the metric at each driver's low and high value, and rows sorted by
 * swing, largest first. The ends are the values given per driver id where
 * given, else by default each driver's realistic range (ranges.ts:
 * `realisticRange`), or with `relative` a number ±that share of the base
 * (0.2 = ±20 %; a driver whose base is 0 then takes its absolute zero-base
 * range); always clamped to the driver's valid range.
 *
 * @example tornado(ev, [{ key: 'fuelPrice' }])[0].low        // = 0.75 × the base fuel price (realistic −25 %)
 * @example tornado(ev, [{ key: 'fuelPrice' }], {}, 0.2)[0].low // = 0.8 × the base fuel price
 */
export function tornado(
  ev: Evaluator,
  drivers: readonly DriverRef[],
  ranges: Readonly<Record<string, { low: number; high: number }>> = {},
  relative: number | 'realistic' = 'realistic',
): TornadoRow[] {
  const rows = drivers.map((d) => {
    const base = getDriver(ev.base, d);
    const given = ranges[driverId(d)];
    const [low, high] = given
      ? [clampDriver(d, given.low), clampDriver(d, given.high)]
      : relative === 'realistic'
        ? realisticRange(d, base)
        : uniformRange(d, base, relative);
    const metricLow = ev.at([[d, low]]);
    const metricHigh = ev.at([[d, high]]);
    return { driver: driverId(d), base, low, high, metricLow, metricHigh, swing: Math.abs(metricHigh - metricLow) };
  });
  return rows.sort((a, b) => b.swing - a.swing);
}

export interface SpiderLine {
  driver: string;
  base: number;
  points: { change: number; value: number; metric: number }[];
}

/**
 * Spider: the metric against the fractional change of each driver
 * (−0.3 … +0.3 by default), the value being base·(1 + change) clamped.
 */
export function spider(ev: Evaluator, drivers: readonly DriverRef[], changes: readonly number[] = [-0.3, -0.2, -0.1, 0, 0.1, 0.2, 0.3]): SpiderLine[] {
  return drivers.map((d) => {
    const base = getDriver(ev.base, d);
    const points = changes.map((change) => {
      const value = clampDriver(d, base * (1 + change));
      return { change, value, metric: change === 0 ? ev.baseValue : ev.at([[d, value]]) };
    });
    return { driver: driverId(d), base, points };
  });
}

/**
 * Spider over the realistic ranges: the metric at positions t of each
 * driver's realistic range (ranges.ts), t = −1 its low, 0 the base, +1 its
 * high, the value base + |t|·(end − base) on either side; `change` carries t.
 *
 * @example spiderRealistic(ev, [{ key: 'fuelPrice' }], [-1, 0, 1])[0].points[2].value // = 1.25 × the base fuel price
 */
export function spiderRealistic(ev: Evaluator, drivers: readonly DriverRef[], positions: readonly number[] = [-1, -2 / 3, -1 / 3, 0, 1 / 3, 2 / 3, 1]): SpiderLine[] {
  return drivers.map((d) => {
    const base = getDriver(ev.base, d);
    const [low, high] = realisticRange(d, base);
    const points = positions.map((t) => {
      const value = clampDriver(d, t < 0 ? base + -t * (low - base) : base + t * (high - base));
      return { change: t, value, metric: t === 0 ? ev.baseValue : ev.at([[d, value]]) };
    });
    return { driver: driverId(d), base, points };
  });
}

export interface TwoWayTable {
  rowDriver: string;
  columnDriver: string;
  rowValues: number[];
  columnValues: number[];
  /** metric[i][j] at rowValues[i] and columnValues[j] */
  metric: number[][];
}

/** The metric over a grid of two drivers' values (default: 5 steps each from −20 % to +20 %). */
export function twoWay(ev: Evaluator, row: DriverRef, column: DriverRef, rowValues?: number[], columnValues?: number[]): TwoWayTable {
  const grid = (d: DriverRef) => [-0.2, -0.1, 0, 0.1, 0.2].map((c) => clampDriver(d, getDriver(ev.base, d) * (1 + c)));
  const rv = rowValues ?? grid(row);
  const cv = columnValues ?? grid(column);
  const metric = rv.map((r) => cv.map((c) => ev.at([[row, r], [column, c]])));
  return { rowDriver: driverId(row), columnDriver: driverId(column), rowValues: rv, columnValues: cv, metric };
}
