/**
 * What a sensitivity run measures, and an evaluator that re-runs the case
 * with some drivers changed (on one working clone, reset after each run).
 */
import type { CaseFileInput } from '@/lib/validation/case';
import { evaluateNpvs } from '../evaluate';
import type { PolicyKey } from '../types';
import { timingOption, truckSetupOf, type TimingSpec } from '../timing';
import { createCaseNpvs, fleetBestNpv, type CaseNpvs } from '../npv-only';
import { cloneCase, getDriver, setDriver, type DriverRef } from './drivers';
import { trucksTouchedByAll } from './touched';

/**
 * - `truck-delta`: one truck's Δnpv of repower against rebuild (USD);
 * - `fleet-delta`: the same summed over the fleet (repower every truck vs rebuild every truck);
 * - `fleet-best`: the fleet's npv with each truck on its best policy (chosen again in each run);
 * - `proposal`: Σ over trucks of npv(policies[truck]) − npv(rebuild), the case's
 *   proposal against rebuilding every engine. The policy of each truck is
 *   held fixed while the inputs vary (what is proposed is tested, not the best
 *   answer to each changed input); a truck the map does not name counts as
 *   rebuilt (adds 0). Zero: the proposal just breaks even against rebuilding.
 *   `timings` gives a repowered truck its chosen timing (the fleet programme's
 *   option: now, or at the k-th planned event d months late, lib/engine/timing.ts):
 *   its npv(repower) is then that option's npv, re-valued as the inputs vary.
 *
 * @example
 * // npvs (keep, rebuild, repower) A: (10, 8, 12), B: (5, 7, 4), C: (0, 3, 9);
 * // proposal { A: repower, B: keep, C: rebuild } = (12 − 8) + (5 − 7) + (3 − 3) = 2
 */
export type Metric =
  | { kind: 'truck-delta'; truckId: string }
  | { kind: 'fleet-delta' }
  | { kind: 'fleet-best' }
  | { kind: 'proposal'; policies: Readonly<Record<string, PolicyKey>>; timings?: Readonly<Record<string, TimingSpec>> };

/** Trucks of the case (by index) whose repower the proposal times (metric `timings`), with their timing. */
function timedTrucks(c: CaseFileInput, metric: Metric): { index: number; spec: TimingSpec }[] {
  if (metric.kind !== 'proposal' || !metric.timings) return [];
  const out: { index: number; spec: TimingSpec }[] = [];
  c.trucks.forEach((t, index) => {
    const spec = metric.timings?.[t.id];
    if (spec && metric.policies[t.id] === 'repower') out.push({ index, spec });
  });
  return out;
}

/** Write each timed truck's option npv over its repower npv (only trucks in `which`, or all when null). */
function applyTimings(c: CaseFileInput, n: CaseNpvs, timed: readonly { index: number; spec: TimingSpec }[], which: ReadonlySet<number> | null): void {
  for (const { index, spec } of timed) {
    if (which && !which.has(index)) continue;
    n.repower[index] = timingOption(truckSetupOf(c, c.trucks[index].id), spec).npv;
  }
}

/** Δnpv metrics: zero means the repower (or the proposal) just breaks even against rebuilding. */
export function isDeltaMetric(m: Metric): boolean {
  return m.kind !== 'fleet-best';
}

/** npv(policy) − npv(rebuild) of truck i. */
function gainOverRebuild(n: CaseNpvs, i: number, policy: PolicyKey | undefined): number {
  if (policy === 'repower') return n.repower[i] - n.rebuild[i];
  if (policy === 'keep') return n.keep[i] - n.rebuild[i];
  return 0;
}

/**
 * The metric from npvs already evaluated for `c`: a proposal's timed trucks
 * (`timings`) are valued at their option's npv first. `n` is changed in place
 * (its `repower` entries of the timed trucks).
 */
export function readMetricOf(c: CaseFileInput, n: CaseNpvs, m: Metric): number {
  applyTimings(c, n, timedTrucks(c, m), null);
  return readMetric(n, m);
}

export function readMetric(n: CaseNpvs, m: Metric): number {
  if (m.kind === 'fleet-best') return fleetBestNpv(n);
  if (m.kind === 'proposal') {
    let sum = 0;
    for (let i = 0; i < n.truckIds.length; i++) sum += gainOverRebuild(n, i, m.policies[n.truckIds[i]]);
    return sum;
  }
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

/** The policies of a proposal, checked: every truck named is in the case, every policy is one of the three. */
export function checkProposalPolicies(validCase: CaseFileInput, policies: Readonly<Record<string, PolicyKey>>): void {
  const ids = new Set(validCase.trucks.map((t) => t.id));
  for (const [id, p] of Object.entries(policies)) {
    if (!ids.has(id)) throw new RangeError(`the proposal names truck "${id}", which is not in the case`);
    if (p !== 'keep' && p !== 'rebuild' && p !== 'repower') throw new RangeError(`the proposal gives truck "${id}" an unknown policy "${String(p)}"`);
  }
}

/**
 * An evaluator over a validated case. For a one-truck metric only that truck
 * is evaluated (the others do not change it). Otherwise the base case's npvs
 * are kept, and each run re-evaluates only the trucks its drivers touch
 * (`trucksTouched`: a driver on one engine type or offer touches the trucks
 * that use it, an assumption every truck), the others keeping their base
 * npvs: the same numbers as re-evaluating the whole case (a property test
 * holds it), since each truck's npvs depend only on its own inputs and the
 * metric sums the trucks in case order either way.
 * An all-trucks driver ("annualHours@*") touches every truck, on every fleet
 * metric alike (a proposal's rebuilt trucks add 0 but are still evaluated).
 */
export function makeEvaluator(validCase: CaseFileInput, metric: Metric): Evaluator {
  if (metric.kind === 'proposal') checkProposalPolicies(validCase, metric.policies);
  const timed = timedTrucks(validCase, metric);
  const base =
    metric.kind === 'truck-delta' ? { ...validCase, trucks: validCase.trucks.filter((t) => t.id === metric.truckId) } : validCase;
  if (base.trucks.length === 0) throw new RangeError(`no truck with id "${(metric as { truckId: string }).truckId}"`);
  const work = cloneCase(base);
  const count = base.trucks.length;
  let baseNpvs: CaseNpvs | null = null;
  const merged = createCaseNpvs(count);
  const evaluate = (overrides: readonly Override[]): number => {
    const touched = baseNpvs === null ? null : trucksTouchedByAll(work, overrides.map(([d]) => d));
    if (touched === null || touched.length === count) {
      const all = evaluateNpvs(work, { trusted: true });
      applyTimings(work, all, timed, null);
      if (baseNpvs === null) baseNpvs = all;
      return readMetric(all, metric);
    }
    const from = baseNpvs as CaseNpvs;
    merged.truckIds = from.truckIds;
    merged.keep.set(from.keep);
    merged.rebuild.set(from.rebuild);
    merged.repower.set(from.repower);
    for (let i = 0; i < count; i++) merged.best[i] = from.best[i];
    if (touched.length > 0) {
      const some = evaluateNpvs({ ...work, trucks: touched.map((i) => work.trucks[i]) }, { trusted: true });
      touched.forEach((i, k) => {
        merged.keep[i] = some.keep[k];
        merged.rebuild[i] = some.rebuild[k];
        merged.repower[i] = some.repower[k];
        merged.best[i] = some.best[k];
      });
      applyTimings(work, merged, timed, new Set(touched));
    }
    return readMetric(merged, metric);
  };
  const at = (overrides: readonly Override[]): number => {
    const saved = overrides.map(([d]) => getDriver(work, d));
    for (const [d, v] of overrides) setDriver(work, base, d, v);
    try {
      return evaluate(overrides);
    } finally {
      for (let i = overrides.length - 1; i >= 0; i--) setDriver(work, base, overrides[i][0], saved[i]);
    }
  };
  return { base, at, baseValue: at([]) };
}

/** The same evaluator re-evaluating every truck on every run (the plain definition the touched-trucks path must equal). */
export function makeFullEvaluator(validCase: CaseFileInput, metric: Metric): Evaluator {
  const base =
    metric.kind === 'truck-delta' ? { ...validCase, trucks: validCase.trucks.filter((t) => t.id === metric.truckId) } : validCase;
  if (base.trucks.length === 0) throw new RangeError(`no truck with id "${(metric as { truckId: string }).truckId}"`);
  const work = cloneCase(base);
  const at = (overrides: readonly Override[]): number => {
    const saved = overrides.map(([d]) => getDriver(work, d));
    for (const [d, v] of overrides) setDriver(work, base, d, v);
    try {
      const n = evaluateNpvs(work, { trusted: true });
      applyTimings(work, n, timedTrucks(validCase, metric), null);
      return readMetric(n, metric);
    } finally {
      for (let i = overrides.length - 1; i >= 0; i--) setDriver(work, base, overrides[i][0], saved[i]);
    }
  };
  return { base, at, baseValue: at([]) };
}
