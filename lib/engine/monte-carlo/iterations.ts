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
import { evaluateNpvs } from '../npv-only';
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
  const engines = new Map(validCase.engines.map((e) => [e.id, e]));
  const truckIndex = new Map(validCase.trucks.map((t, i) => [t.id, i]));
  const npvs = new Float64Array((to - from) * trucks * POLICY_SLOTS);
  const every = control.every ?? 100;
  // one uniform per (truck, engine life), shared by the three policies: the same
  // engine life fails at the same quantile whatever the policy (common random numbers)
  const lifeU: number[][] = Array.from({ length: trucks }, () => []);

  let done = 0;
  for (let i = from; i < to; i++) {
    const rng = xoroshiro128plus(iterationSeed(spec.seed, i));
    for (const a of active) setDriver(work, validCase, a.ref, clampDriver(a.ref, sampleDistribution(a.dist, uniformFloat64(rng), a.base)));
    let failureAge: ((ctx: FailureAgeContext) => number) | undefined;
    if (spec.sampleFailures) {
      for (const l of lifeU) l.length = 0;
      failureAge = (ctx) => {
        const us = lifeU[truckIndex.get(ctx.truckId) as number];
        while (us.length <= ctx.lifeIndex) us.push(uniformFloat64(rng));
        // engines are read from the working case: a driver may have moved their Weibull law
        const e = work.engines.find((x) => x.id === ctx.engineId) ?? engines.get(ctx.engineId)!;
        return sampleWeibullAge(us[ctx.lifeIndex], e.weibullShape, e.weibullScaleHours, ctx.startAge);
      };
    }
    const r = evaluateNpvs(work, { trusted: true, failureAge });
    const off = (i - from) * trucks * POLICY_SLOTS;
    for (let t = 0; t < trucks; t++) {
      npvs[off + t * 3] = r.keep[t];
      npvs[off + t * 3 + 1] = r.rebuild[t];
      npvs[off + t * 3 + 2] = r.repower[t];
    }
    done++;
    if (done % every === 0) {
      control.onProgress?.(done);
      if (control.shouldStop?.()) break;
    }
  }
  return { npvs: done === to - from ? npvs : npvs.slice(0, done * trucks * POLICY_SLOTS), done };
}
