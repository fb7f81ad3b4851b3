/**
 * Monte Carlo estimate of MODEL.md section 11's expectation over failure
 * ages, on the reference path (tests/support/reference-path.ts): every engine
 * life's failure age is drawn from its Weibull law, the path is run, and the
 * per-period amounts are averaged. Plain and slow: an independent check of
 * the engine's deterministic expected valuation.
 *
 * Failure ages (MODEL.md section 11, inverse CDF, U uniform in (0, 1)):
 * - the engine fitted at the start, given survival to a0 (P(X > a0 + s | X > a0) = R(a0 + s)/R(a0)):
 *   X = η·((a0/η)^β − ln U)^(1/β);
 * - a life that starts at age 0: X = η·(−ln U)^(1/β).
 *
 * Random numbers: mulberry32 (Tommy Ettinger's 32-bit generator, public
 * domain: a Weyl sequence step of 0x6D2B79F5 followed by an xorshift-multiply
 * mix), U = (k + 0.5)/2^32 for its 32-bit output k, so U is never 0 or 1.
 * One generator per call, seeded with `seed`; draws are taken in the order
 * the lives start, policy after policy.
 *
 * @example
 * const s = sampledExpectation(oneTruck, 'T-01', 'rebuild', 20000, 7);
 * s.periods[1].overhauls.mean  // E[overhauls category of year 1]
 * s.periods[1].overhauls.se    // its standard error
 */
import { gamma } from 'mathjs';
import type { CaseFile, CaseFileInput, Engine } from '@/lib/validation/case';
import {
  REF_CATEGORIES,
  REF_EVENT_KINDS,
  REF_QUANTITIES,
  referencePath,
  type AgeSource,
  type RefPolicy,
} from './reference-path';

/** mulberry32: returns a function giving uniforms in (0, 1). */
export function mulberry32(seed: number): () => number {
  let state = seed >>> 0;
  return () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (((t ^ (t >>> 14)) >>> 0) + 0.5) / 4294967296;
  };
}

/** Failure age of a life starting at `startAge` from one uniform U (MODEL.md section 11, inverse CDF). */
export function weibullAgeFromUniform(engine: Engine, startAge: number, u: number): number {
  const b = engine.weibullShape;
  const eta = engine.weibullScaleHours;
  return eta * Math.pow(Math.pow(startAge / eta, b) - Math.log(u), 1 / b);
}

/** An age source drawing every life's failure age from `uniform`. */
export function sampledAges(uniform: () => number): AgeSource {
  return (_lifeIndex, engine, startAge) => weibullAgeFromUniform(engine, startAge, uniform());
}

/** Weibull mean life E[X] = η·Γ(1 + 1/β) (Γ from mathjs). */
export function weibullMeanLife(shape: number, scale: number): number {
  return scale * (gamma(1 + 1 / shape) as number);
}

export interface Estimate {
  mean: number;
  /** standard error of the mean: sample standard deviation / √n */
  se: number;
  /** smallest and largest value sampled */
  min: number;
  max: number;
}

export type SampledPeriod = Record<(typeof REF_CATEGORIES)[number] | 'cashFlow', Estimate> &
  Record<(typeof REF_QUANTITIES)[number], Estimate> & {
    period: number;
    events: Record<(typeof REF_EVENT_KINDS)[number], Estimate>;
  };

export interface SampledExpectation {
  horizonYears: number;
  iterations: number;
  periods: SampledPeriod[];
  npv: Estimate;
  failureBeforePlanned: Estimate;
  totals: Record<(typeof REF_QUANTITIES)[number], Estimate>;
}

/** Running sums of a quantity and its square. */
class Tally {
  sum = 0;
  sumSq = 0;
  min = Infinity;
  max = -Infinity;
  add(x: number) {
    this.sum += x;
    this.sumSq += x * x;
    if (x < this.min) this.min = x;
    if (x > this.max) this.max = x;
  }
  estimate(n: number): Estimate {
    const mean = this.sum / n;
    if (n < 2) return { mean, se: 0, min: this.min, max: this.max };
    const variance = Math.max(0, (this.sumSq - n * mean * mean) / (n - 1));
    return { mean, se: Math.sqrt(variance / n), min: this.min, max: this.max };
  }
}

/**
 * Mean and standard error, over `iterations` sampled paths, of every
 * per-period amount of one truck and policy, of npv and of
 * failureBeforePlanned (MODEL.md section 11).
 */
export function sampledExpectation(
  caseFile: CaseFileInput | CaseFile,
  truckId: string,
  policy: RefPolicy,
  iterations: number,
  seed: number,
): SampledExpectation {
  if (!(iterations >= 1)) throw new Error('iterations must be at least 1');
  const uniform = mulberry32(seed);
  const ages = sampledAges(uniform);
  const keys = [...REF_CATEGORIES, 'cashFlow', ...REF_QUANTITIES] as const;
  let tallies: { amounts: Record<string, Tally>; events: Record<string, Tally> }[] | null = null;
  const npv = new Tally();
  const fbp = new Tally();
  const totals = Object.fromEntries(REF_QUANTITIES.map((q) => [q, new Tally()])) as Record<string, Tally>;
  let horizonYears = 0;

  // For precision, amounts are tallied as deviations from the first path (the
  // shift leaves the standard error unchanged and keeps sumSq small).
  let first: ReturnType<typeof referencePath> | null = null;
  for (let i = 0; i < iterations; i++) {
    const path = referencePath(caseFile, truckId, policy, ages);
    if (!first) {
      first = path;
      horizonYears = path.horizonYears;
      tallies = path.periods.map(() => ({
        amounts: Object.fromEntries(keys.map((k) => [k, new Tally()])),
        events: Object.fromEntries(REF_EVENT_KINDS.map((k) => [k, new Tally()])),
      }));
    }
    const f = first;
    path.periods.forEach((p, y) => {
      const t = tallies![y];
      for (const k of keys) t.amounts[k].add(p[k] - f.periods[y][k]);
      for (const k of REF_EVENT_KINDS) t.events[k].add(p.events[k]);
    });
    npv.add(path.npv - f.npv);
    fbp.add(path.failureBeforePlanned);
    for (const q of REF_QUANTITIES) totals[q].add(path.totals[q] - f.totals[q]);
  }
  const f = first!;
  const shifted = (t: Tally, base: number): Estimate => {
    const e = t.estimate(iterations);
    return { mean: base + e.mean, se: e.se, min: base + e.min, max: base + e.max };
  };
  const periods = tallies!.map((t, y) => {
    const out: Record<string, unknown> = { period: y };
    for (const k of keys) out[k] = shifted(t.amounts[k], f.periods[y][k]);
    out.events = Object.fromEntries(REF_EVENT_KINDS.map((k) => [k, t.events[k].estimate(iterations)]));
    return out as SampledPeriod;
  });
  return {
    horizonYears,
    iterations,
    periods,
    npv: shifted(npv, f.npv),
    failureBeforePlanned: fbp.estimate(iterations),
    totals: Object.fromEntries(REF_QUANTITIES.map((q) => [q, shifted(totals[q], f.totals[q])])) as Record<
      (typeof REF_QUANTITIES)[number],
      Estimate
    >,
  };
}
