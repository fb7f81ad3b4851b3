/**
 * Monte Carlo iterations over a validated case: each iteration draws every
 * driver from its distribution and, when asked, each engine life's failure
 * age from its Weibull law, then evaluates the npvs on the lean path.
 *
 * Iteration i has its own generator, seeded from (seed, i): the same seed
 * gives the same numbers however the iterations are split among workers.
 */
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import type { CaseFileInput } from '@/lib/validation/case';
import { createCaseNpvs, createNpvWorkspace, evaluateNpvsInto } from '../npv-only';
import type { Engine } from '@/lib/validation/case';
import { sampleWeibullAge } from '../reliability';
import { clampDriver, cloneCase, getDriver, parseDriverId, setDriver, type DriverRef } from '../sensitivity/drivers';
import type { FailureAgeContext } from '../types';
import { sampleDistribution, type Distribution } from './distributions';

export interface MonteCarloSpec {
  iterations: number;
  seed: number;
  /** driver id → distribution; drivers not listed keep their value */
  distributions: { driver: string; distribution: Distribution }[];
  /** draw each engine life's failure age from its Weibull law (else the median path) */
  sampleFailures: boolean;
}

/** Per iteration and truck, the npvs of keep, rebuild and repower: index (i·trucks + t)·3 + policy. */
export const POLICY_SLOTS = 3;

/**
 * A 32-bit seed for iteration i from the run's seed (the murmur3 finaliser
 * over a golden-ratio step), so neighbouring iterations get unrelated streams.
 */
export function iterationSeed(seed: number, i: number): number {
  let h = (seed ^ Math.imul(i + 1, 0x9e3779b9)) >>> 0;
  h = Math.imul(h ^ (h >>> 16), 0x85ebca6b);
  h = Math.imul(h ^ (h >>> 13), 0xc2b2ae35);
  return (h ^ (h >>> 16)) | 0;
}

export interface RunControl {
  /** called every `every` iterations with the count done in this call */
  onProgress?: (done: number) => void;
  every?: number;
  /** checked with each progress call; true stops the run (the figures so far are returned) */
  shouldStop?: () => boolean;
  /** write the npvs here (at least (to − from)·trucks·3 long, e.g. a worker's block of a shared buffer) */
  into?: Float64Array;
}

/**
 * Run iterations [from, to) and return their npvs and how many ran.
 * The case must be valid (validateCase) and the spec checked (driver ids exist).
 */
export function runIterations(
  validCase: CaseFileInput,
  spec: MonteCarloSpec,
  from: number,
  to: number,
  control: RunControl = {},
): { npvs: Float64Array; done: number } {
  const trucks = validCase.trucks.length;
  const work = cloneCase(validCase);
  const active: { ref: DriverRef; dist: Distribution; base: number }[] = spec.distributions
    .filter((d) => d.distribution.kind !== 'fixed')
    .map((d) => {
      const ref = parseDriverId(d.driver);
      return { ref, dist: d.distribution, base: getDriver(validCase, ref) };
    });
  const npvs = control.into ?? new Float64Array((to - from) * trucks * POLICY_SLOTS);
  if (npvs.length < (to - from) * trucks * POLICY_SLOTS) throw new RangeError('runIterations: the output buffer is too short');
  const every = control.every ?? 100;
  // one uniform per (truck, engine life), shared by the three policies: the same
  // engine life fails at the same quantile whatever the policy (common random numbers)
  const lifeU: number[][] = Array.from({ length: trucks }, () => []);
  // the failure age drawn for (truck, life), by engine and start age: the policies often
  // ask for the same one (life 0 always; keep and rebuild after that), and it is the same number
  const ages = Array.from({ length: trucks }, () => new AgeCache());
  const result = createCaseNpvs(trucks);
  const ws = createNpvWorkspace();
  let rng = xoroshiro128plus(0);

  const failureAge = (ctx: FailureAgeContext): number => {
    const t = ctx.truckIndex;
    const us = lifeU[t];
    while (us.length <= ctx.lifeIndex) us.push(uniformFloat64(rng));
    const cache = ages[t];
    // ctx.engine is the working case's engine object: drivers change it in place, so it holds the sampled law
    const e = ctx.engine;
    const hit = cache.find(ctx.lifeIndex, e, ctx.startAge);
    if (hit >= 0) return cache.age[hit];
    const age = sampleWeibullAge(us[ctx.lifeIndex], e.weibullShape, e.weibullScaleHours, ctx.startAge);
    cache.add(ctx.lifeIndex, e, ctx.startAge, age);
    return age;
  };

  let done = 0;
  for (let i = from; i < to; i++) {
    rng = xoroshiro128plus(iterationSeed(spec.seed, i));
    for (const a of active) setDriver(work, validCase, a.ref, clampDriver(a.ref, sampleDistribution(a.dist, uniformFloat64(rng), a.base)));
    if (spec.sampleFailures) {
      for (let t = 0; t < trucks; t++) {
        lifeU[t].length = 0;
        ages[t].clear();
      }
    }
    evaluateNpvsInto(work, spec.sampleFailures ? failureAge : undefined, result, ws);
    const off = (i - from) * trucks * POLICY_SLOTS;
    for (let t = 0; t < trucks; t++) {
      npvs[off + t * 3] = result.keep[t];
      npvs[off + t * 3 + 1] = result.rebuild[t];
      npvs[off + t * 3 + 2] = result.repower[t];
    }
    done++;
    if (done % every === 0) {
      control.onProgress?.(done);
      if (control.shouldStop?.()) break;
    }
  }
  const length = done * trucks * POLICY_SLOTS;
  if (control.into) return { npvs: npvs.subarray(0, length), done };
  return { npvs: done === to - from ? npvs : npvs.slice(0, length), done };
}

/**
 * Failure ages of one truck in one iteration, keyed by (life, engine, start
 * age): two slots per life (a truck's lives after the first run on one of two
 * engines); a third combination is simply not cached. `clear` bumps an epoch.
 */
class AgeCache {
  epoch = 1;
  stamp: number[] = [];
  engine: Engine[] = [];
  start: number[] = [];
  age: number[] = [];

  clear(): void {
    this.epoch++;
  }

  find(life: number, engine: Engine, start: number): number {
    for (let k = life * 2; k < life * 2 + 2; k++) {
      if (this.stamp[k] === this.epoch && this.start[k] === start && this.engine[k] === engine) return k;
    }
    return -1;
  }

  add(life: number, engine: Engine, start: number, age: number): void {
    let k = life * 2;
    while (this.stamp.length < k + 2) this.stamp.push(0);
    if (this.stamp[k] === this.epoch) k++;
    if (this.stamp[k] === this.epoch) return;
    this.stamp[k] = this.epoch;
    this.engine[k] = engine;
    this.start[k] = start;
    this.age[k] = age;
  }
}
