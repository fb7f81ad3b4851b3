/**
 * Monte Carlo: fixed inputs reproduce the deterministic engine exactly;
 * sampled failure ages follow the Weibull law (Kolmogorov–Smirnov) and its
 * conditional form R(T0+t)/R(T0) (MIL-HDBK-338B; Nelson 1982); seeds
 * reproduce; input distributions have the stated shape.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { describe, expect, it } from 'vitest';
import { evaluateCase, sampleWeibullAge, validateCase, weibullCdf, weibullReliability } from '@/lib/engine';
import {
  iterationSeed,
  normalQuantile,
  percentileSorted,
  runIterations,
  sampleDistribution,
  summarise,
  summariseRun,
  type MonteCarloSpec,
} from '@/lib/engine/monte-carlo';

const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8'));
const v = validateCase(raw);
if (!v.ok) throw new Error('demo case invalid');
const demo = v.value;

const spec = (over: Partial<MonteCarloSpec> = {}): MonteCarloSpec => ({
  iterations: 40,
  seed: 20261201,
  sampleFailures: true,
  distributions: [
    { driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.85, mode: 1.05, max: 1.4 } },
    { driver: 'modulePrice@kestrel-km2700', distribution: { kind: 'normal', mean: 1650000, sd: 120000, min: 1400000, max: 1950000 } },
    { driver: 'discountRate', distribution: { kind: 'uniform', min: 0.06, max: 0.1 } },
  ],
  ...over,
});

/** One-sample Kolmogorov–Smirnov statistic D = sup |F_n(x) − F(x)|. */
function ksStatistic(samples: number[], cdf: (x: number) => number): number {
  const s = [...samples].sort((a, b) => a - b);
  const n = s.length;
  let d = 0;
  s.forEach((x, i) => {
    const f = cdf(x);
    d = Math.max(d, Math.abs((i + 1) / n - f), Math.abs(f - i / n));
  });
  return d;
}
/** Critical value of D at α = 0.05 for large n: 1.358/√n (Massey, 1951). */
const ksCritical = (n: number) => 1.358 / Math.sqrt(n);

/** Failure ages drawn the way the Monte Carlo does: one uniform from iteration i's own generator. */
function drawAges(n: number, seed: number, shape: number, scale: number, age: number): number[] {
  return Array.from({ length: n }, (_, i) => sampleWeibullAge(uniformFloat64(xoroshiro128plus(iterationSeed(seed, i))), shape, scale, age));
}

describe('Monte Carlo iterations', () => {
  it('with every distribution fixed and failure sampling off, equals the median path in every iteration (whatever the case\'s valuation)', () => {
    const fixed = spec({ sampleFailures: false, distributions: [{ driver: 'fuelPrice', distribution: { kind: 'fixed' } }] });
    const { npvs, done } = runIterations(demo, fixed, 0, 5);
    expect(done).toBe(5);
    const det = evaluateCase({ ...demo, assumptions: { ...demo.assumptions, valuation: 'median-path' } });
    const t = demo.trucks.length;
    for (let i = 0; i < 5; i++) {
      det.trucks.forEach((tr, k) => {
        expect(npvs[(i * t + k) * 3]).toBe(tr.options.keep.npv);
        expect(npvs[(i * t + k) * 3 + 1]).toBe(tr.options.rebuild.npv);
        expect(npvs[(i * t + k) * 3 + 2]).toBe(tr.options.repower.npv);
      });
    }
  });

  it('gives the same numbers for the same seed, however the iterations are split, and others for another seed', () => {
    const a = runIterations(demo, spec(), 0, 40).npvs;
    const b = runIterations(demo, spec(), 0, 40).npvs;
    expect(Array.from(b)).toEqual(Array.from(a));
    const split = [...runIterations(demo, spec(), 0, 17).npvs, ...runIterations(demo, spec(), 17, 40).npvs];
    expect(split).toEqual(Array.from(a));
    const other = runIterations(demo, spec({ seed: 7 }), 0, 40).npvs;
    expect(Array.from(other)).not.toEqual(Array.from(a));
    const ids = demo.trucks.map((t) => t.id);
    expect(summariseRun(ids, a).fleet.deltaNpv.mean).toBe(summariseRun(ids, Float64Array.from(split)).fleet.deltaNpv.mean);
    expect(summariseRun(ids, other).fleet.deltaNpv.mean).not.toBe(summariseRun(ids, a).fleet.deltaNpv.mean);
  });

  it('stops when asked and reports how many iterations ran', () => {
    const r = runIterations(demo, spec(), 0, 40, { every: 10, shouldStop: () => true });
    expect(r.done).toBe(10);
    expect(r.npvs.length).toBe(10 * demo.trucks.length * 3);
  });

  it('spreads the results when failures are sampled (not the median path every time)', () => {
    const only = spec({ distributions: [] });
    const r = summariseRun(demo.trucks.map((t) => t.id), runIterations(demo, only, 0, 40).npvs);
    expect(r.fleet.deltaNpv.sd).toBeGreaterThan(0);
    expect(r.trucks).toHaveLength(demo.trucks.length);
  });
});

describe('sampled failure ages follow the Weibull law', () => {
  const shape = 3.2;
  const scale = 24000;
  const n = 4000;

  it('new engines: the empirical distribution matches F(t) = 1 − exp(−(t/η)^β) (KS below its 5 % critical value)', () => {
    const ages = drawAges(n, 11, shape, scale, 0);
    expect(ksStatistic(ages, (t) => weibullCdf(t, shape, scale))).toBeLessThan(ksCritical(n));
  });

  it('an engine already at T0: survival follows P(T > T0+t | T > T0) = R(T0+t)/R(T0)', () => {
    const t0 = 16500;
    const ages = drawAges(n, 12, shape, scale, t0);
    expect(Math.min(...ages)).toBeGreaterThan(t0);
    const conditionalCdf = (x: number) => 1 - weibullReliability(x, shape, scale) / weibullReliability(t0, shape, scale);
    expect(ksStatistic(ages, conditionalCdf)).toBeLessThan(ksCritical(n));
    // and at a few points, the share surviving a further t against the formula
    for (const t of [2000, 6000, 10000]) {
      const share = ages.filter((a) => a > t0 + t).length / n;
      expect(Math.abs(share - weibullReliability(t0 + t, shape, scale) / weibullReliability(t0, shape, scale))).toBeLessThan(0.03);
    }
  });

  it('the conditional form, worked: β = 2, η = 1000, T0 = 500, t = 500 gives exp(−1)/exp(−0.25) = 0.4723666', () => {
    const ages = drawAges(n, 13, 2, 1000, 500);
    expect(Math.abs(ages.filter((a) => a > 1000).length / n - 0.4723666)).toBeLessThan(0.025);
  });

  it('a uniform-law check of the seeds themselves: the first draws of successive iterations are uniform', () => {
    const us = Array.from({ length: n }, (_, i) => uniformFloat64(xoroshiro128plus(iterationSeed(5, i))));
    expect(ksStatistic(us, (x) => Math.min(1, Math.max(0, x)))).toBeLessThan(ksCritical(n));
  });
});

describe('input distributions and summaries', () => {
  it('samples the documented quantiles', () => {
    expect(sampleDistribution({ kind: 'triangular', min: 0, mode: 1, max: 2 }, 0.5, 0)).toBe(1);
    expect(sampleDistribution({ kind: 'uniform', min: 2, max: 4 }, 0.25, 0)).toBe(2.5);
    expect(sampleDistribution({ kind: 'fixed' }, 0.9, 7)).toBe(7);
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    // symmetric truncation keeps the median at the mean
    expect(sampleDistribution({ kind: 'normal', mean: 10, sd: 2, min: 7, max: 13 }, 0.5, 0)).toBeCloseTo(10, 6);
    for (const u of [0, 1e-9, 0.3, 0.999999999, 1]) {
      const x = sampleDistribution({ kind: 'normal', mean: 10, sd: 5, min: 8, max: 11 }, u, 0);
      expect(x).toBeGreaterThanOrEqual(8);
      expect(x).toBeLessThanOrEqual(11);
    }
  });

  it('computes percentiles as PERCENTILE.INC and the chance of a loss', () => {
    expect(percentileSorted([1, 2, 3, 4], 0.5)).toBe(2.5);
    const s = summarise(Float64Array.from([-2, -1, 1, 2, 3, 4, 5, 6, 7, 8]), 5);
    expect(s.mean).toBe(3.3);
    expect(s.probNegative).toBe(0.2);
    expect(s.p10).toBeCloseTo(-1.1 + 0.0, 9); // h = 0.9: −2 + 0.9·(−1 − (−2))
    expect(s.histogram.reduce((a, b) => a + b.count, 0)).toBe(10);
    expect(s.runningMean.at(-1)).toEqual([10, 3.3]);
  });
});
