/**
 * The fast Monte Carlo loop (reused buffers, cached failure ages, shared year
 * tables) against the plain definition of an iteration: clone the case, set
 * each sampled driver, and run the full engine (`evaluateCase`) with a
 * provider that draws one uniform per (truck, engine life) from iteration i's
 * own generator, in the order the engine asks. Every npv must be the same
 * number, with many drivers sampled at once (assumptions, engines, offers and
 * every truck), under several accounting settings.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { uniformFloat64 } from 'pure-rand/distribution/uniformFloat64';
import { xoroshiro128plus } from 'pure-rand/generator/xoroshiro128plus';
import { describe, expect, it } from 'vitest';
import { evaluateCase, sampleWeibullAge, validateCase, type CaseFileInput, type FailureAgeContext } from '@/lib/engine';
import { iterationSeed, runIterations, sampleDistribution, type MonteCarloSpec } from '@/lib/engine/monte-carlo';
import { clampDriver, cloneCase, getDriver, parseDriverId, setDriver } from '@/lib/engine/sensitivity/drivers';
import { syntheticFleet } from '@/bench/support/synthetic-fleet';

const demo = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8'));

/** Iteration i by definition, on the full engine. */
function referenceIteration(c: CaseFileInput, spec: MonteCarloSpec, i: number): { keep: number; rebuild: number; repower: number }[] {
  const work = cloneCase(c);
  const rng = xoroshiro128plus(iterationSeed(spec.seed, i));
  for (const d of spec.distributions) {
    if (d.distribution.kind === 'fixed') continue;
    const ref = parseDriverId(d.driver);
    setDriver(work, c, ref, clampDriver(ref, sampleDistribution(d.distribution, uniformFloat64(rng), getDriver(c, ref))));
  }
  const lifeU = new Map<string, number[]>();
  const failureAge = (ctx: FailureAgeContext) => {
    const us = lifeU.get(ctx.truckId) ?? [];
    lifeU.set(ctx.truckId, us);
    while (us.length <= ctx.lifeIndex) us.push(uniformFloat64(rng));
    const e = work.engines.find((x) => x.id === ctx.engineId)!;
    return sampleWeibullAge(us[ctx.lifeIndex], e.weibullShape, e.weibullScaleHours, ctx.startAge);
  };
  const r = evaluateCase(work, { trusted: true, failureAge: spec.sampleFailures ? failureAge : undefined });
  return r.trucks.map((t) => ({ keep: t.options.keep.npv, rebuild: t.options.rebuild.npv, repower: t.options.repower.npv }));
}

const u = (min: number, max: number) => ({ kind: 'uniform' as const, min, max });
const wide: MonteCarloSpec = {
  iterations: 6,
  seed: 4242,
  sampleFailures: true,
  distributions: [
    { driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.85, mode: 1.05, max: 1.4 } },
    { driver: 'discountRate', distribution: u(0.05, 0.11) },
    { driver: 'inflation', distribution: u(0, 0.06) },
    { driver: 'fuelEscalation', distribution: u(0, 0.06) },
    { driver: 'taxRate', distribution: u(0.2, 0.35) },
    { driver: 'carbonPrice', distribution: u(0, 80) },
    { driver: 'modulePrice@kestrel-km2700', distribution: { kind: 'normal', mean: 1650000, sd: 120000, min: 1400000, max: 1950000 } },
    { driver: 'downtimeDays@brannock-bd2000', distribution: u(5, 20) },
    { driver: 'weibullShape@ac-2600-legacy', distribution: u(1.5, 4) },
    { driver: 'weibullScaleHours@km-2700-bypass', distribution: u(18000, 34000) },
    { driver: 'lifeHours@ac-1900-legacy', distribution: u(15000, 26000) },
    { driver: 'bsfcGPerKwh@km-2700-bypass', distribution: u(190, 215) },
    { driver: 'overhaulCost@ac-2600-legacy', distribution: u(700000, 1100000) },
    { driver: 'annualHours@*', distribution: u(5000, 6800) },
    { driver: 'loadFactor@*', distribution: u(0.4, 0.6) },
  ],
};

function expectSameAsReference(input: CaseFileInput, spec: MonteCarloSpec, from: number, to: number) {
  const v = validateCase(input);
  if (!v.ok) throw new Error('invalid case');
  const c = v.value;
  const { npvs, done } = runIterations(c, spec, from, to);
  expect(done).toBe(to - from);
  const trucks = c.trucks.length;
  for (let i = from; i < to; i++) {
    const ref = referenceIteration(c, spec, i);
    ref.forEach((r, t) => {
      const o = ((i - from) * trucks + t) * 3;
      expect([npvs[o], npvs[o + 1], npvs[o + 2]]).toEqual([r.keep, r.rebuild, r.repower]);
    });
  }
}

describe('the Monte Carlo loop equals its definition on the full engine, number for number', () => {
  it('on the demo mine with fifteen drivers and sampled failures', () => {
    expectSameAsReference(demo, wide, 0, 6);
  });

  it('on the demo mine with mid-year timing, capitalised rebuilds and immediate repowers', () => {
    const c = {
      ...demo,
      assumptions: { ...demo.assumptions, timing: 'mid-year', rebuildAccounting: 'capitalise', depreciation: { method: 'declining-balance', years: 5 }, horizonYears: 8 },
      repowerOffers: demo.repowerOffers.map((o: object) => ({ ...o, timing: 'now', productivityGain: 0.02 })),
    };
    expectSameAsReference(c, wide, 3, 7);
  });

  it('on the median path (failure sampling off) and on a synthetic fleet of 60 trucks', () => {
    expectSameAsReference({ ...demo, assumptions: { ...demo.assumptions, valuation: 'median-path' } }, { ...wide, sampleFailures: false }, 0, 3);
    expectSameAsReference(syntheticFleet(demo, 60), wide, 10, 13);
  });
});
