/**
 * What a sensitivity run measures, and an evaluator that re-runs the case
 * with some drivers changed (on one working clone, reset after each run).
 */
import type { CaseFileInput } from '@/lib/validation/case';
import { evaluateNpvs } from '../evaluate';
import { fleetBestNpv, type CaseNpvs } from '../npv-only';
import { cloneCase, getDriver, setDriver, type DriverRef } from './drivers';

/**
 * - `truck-delta`: one truck's Δnpv of repower against rebuild (USD);
 * - `fleet-delta`: the same summed over the fleet (repower every truck vs rebuild every truck);
 * - `fleet-best`: the fleet's npv with each truck on its best policy.
 */
export type Metric = { kind: 'truck-delta'; truckId: string } | { kind: 'fleet-delta' } | { kind: 'fleet-best' };

/** Δnpv metrics: zero means the repower just breaks even. */
export function isDeltaMetric(m: Metric): boolean {
  return m.kind !== 'fleet-best';
}

export function readMetric(n: CaseNpvs, m: Metric): number {
  if (m.kind === 'fleet-best') return fleetBestNpv(n);
  if (m.kind === 'fleet-delta') {
    let sum = 0;
    for (let i = 0; i < n.truckIds.length; i++) sum += n.repower[i] - n.rebuild[i];
    return sum;
  }
  const i = n.truckIds.indexOf(m.truckId);
  if (i < 0) throw new RangeError(`no truck with id "${m.truckId}"`);
  return n.repower[i] - n.rebuild[i];
}

export type Override = readonly [DriverRef, number];

export interface Evaluator {
  base: CaseFileInput;
  /** the metric with the given drivers set (the case is otherwise the base) */
  at(overrides: readonly Override[]): number;
  baseValue: number;
}

/**
 * An evaluator over a validated case. For a one-truck metric only that truck
 * is evaluated (the others do not change it).
 */
export function makeEvaluator(validCase: CaseFileInput, metric: Metric): Evaluator {
  const base =
    metric.kind === 'truck-delta' ? { ...validCase, trucks: validCase.trucks.filter((t) => t.id === metric.truckId) } : validCase;
  if (base.trucks.length === 0) throw new RangeError(`no truck with id "${(metric as { truckId: string }).truckId}"`);
  const work = cloneCase(base);
  const at = (overrides: readonly Override[]): number => {
    const saved = overrides.map(([d]) => getDriver(work, d));
    for (const [d, v] of overrides) setDriver(work, base, d, v);
    try {
      return readMetric(evaluateNpvs(work, { trusted: true }), metric);
    } finally {
      for (let i = overrides.length - 1; i >= 0; i--) setDriver(work, base, overrides[i][0], saved[i]);
    }
  };
  return { base, at, baseValue: at([]) };
}
