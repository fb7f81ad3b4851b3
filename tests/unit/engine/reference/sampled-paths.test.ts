/**
 * The reference path (tests/support/reference-path.ts, from MODEL.md
 * sections 2–8) against `evaluateCase(c, { failureAge })` (the engine's
 * FailureAgeProvider, lib/engine/types.ts) given the SAME failure ages, path
 * by path: ~50 random draws per variant from the Weibull laws of MODEL.md
 * section 11, plus hand-set ages on the 1e-6 ties of MODEL.md section 3
 * (a failure age equal to the planned life is the planned overhaul; an event
 * at the last hour of year N does not happen).
 */
import { describe, expect, it } from 'vitest';
import type { FailureAgeContext, FailureAgeProvider } from '@/lib/engine';
import type { Engine } from '@/lib/validation/case';
import { compareWithEngine, formatMismatch } from '@/tests/support/reference-compare';
import { mulberry32, weibullAgeFromUniform } from '@/tests/support/reference-expectation';
import { medianAges, referencePath, type AgeSource, type RefPolicy } from '@/tests/support/reference-path';
import { loadScenario, referenceVariants, variantOf } from '@/tests/support/reference-variants';

const DRAWS = 50;

/**
 * One set of failure ages shared by the engine and the reference: each life
 * (truck, policy, life index, engine, start age) gets its age the first time
 * either asks, from `uniform`, and keeps it.
 */
function sharedAges(
  uniform: () => number,
  age: (engine: Engine, startAge: number, lifeIndex: number, u: number) => number = (e, s, _i, u) =>
    weibullAgeFromUniform(e, s, u),
) {
  const memo = new Map<string, number>();
  const get = (truckId: string, policy: string, lifeIndex: number, engine: Engine, startAge: number) => {
    const key = `${truckId}|${policy}|${lifeIndex}|${engine.id}|${startAge}`;
    let x = memo.get(key);
    if (x === undefined) {
      x = age(engine, startAge, lifeIndex, uniform());
      memo.set(key, x);
    }
    return x;
  };
  const provider: FailureAgeProvider = (ctx: FailureAgeContext) =>
    get(ctx.truckId, ctx.policy, ctx.lifeIndex, ctx.engine, ctx.startAge);
  const ages =
    (truckId: string, policy: RefPolicy): AgeSource =>
    (lifeIndex, engine, startAge) =>
      get(truckId, policy, lifeIndex, engine, startAge);
  return { provider, ages };
}

describe('reference path agrees with the engine path by path on sampled Weibull ages (MODEL.md §§2–8, §11)', () => {
  referenceVariants().forEach((variant, vi) => {
    it(`${variant.name} (${variant.source}), ${DRAWS} draws`, () => {
      const problems: string[] = [];
      for (let d = 0; d < DRAWS && problems.length < 20; d++) {
        const { provider, ages } = sharedAges(mulberry32(1_000_003 * (vi + 1) + d));
        for (const m of compareWithEngine(variant.caseFile, ages, provider)) problems.push(`draw ${d}: ${formatMismatch(m)}`);
      }
      expect(problems.slice(0, 20)).toEqual([]);
    });
  });

  it('failures a few times a horizon: keep and rebuild with short Weibull lives (scale 4,000 h, shape 1.5)', () => {
    const c = variantOf(loadScenario('one-truck.json'), (c) => {
      c.assumptions.valuation = 'median-path';
      c.trucks[0].remainingLifeHours = 40000;
      for (const e of c.engines) {
        e.weibullScaleHours = 4000;
        e.weibullShape = 1.5;
      }
      c.repowerOffers[0].failedCoreCredit = 30000;
      c.repowerOffers[0].productivityGain = 0.01;
    });
    const problems: string[] = [];
    for (let d = 0; d < DRAWS && problems.length < 20; d++) {
      const { provider, ages } = sharedAges(mulberry32(777 + d));
      for (const m of compareWithEngine(c, ages, provider)) problems.push(`draw ${d}: ${formatMismatch(m)}`);
    }
    expect(problems.slice(0, 20)).toEqual([]);
  });
});

describe('hand-set failure ages on the ties of MODEL.md §3 (ages within 1e-6 h are equal)', () => {
  const one = variantOf(loadScenario('one-truck.json'), (c) => {
    c.assumptions.valuation = 'median-path';
  });
  // T-01: 16,500 h on an engine of 20,000 h life, 6,000 h a year, 18,000 h left (N = 3).
  const lifeZero = (x: number) => (e: Engine, s: number, i: number, u: number) =>
    i === 0 ? x : weibullAgeFromUniform(e, s, u);
  const cases: [string, CaseFileInputLike, number][] = [
    ['failure age exactly the planned life: the planned overhaul', one, 20000],
    ['failure age 1e-7 h short of the planned life: still the planned overhaul', one, 20000 - 1e-7],
    ['failure age 1e-3 h short of the planned life: a failure', one, 20000 - 1e-3],
    ['failure age at the last hour of year 1 (22,500 h)', one, 22500],
    ['failure age exactly at the last hour of year N (34,500 h): does not happen', one, 34500],
    ['failure age 1e-3 h before the last hour of year N: happens in year N', one, 34500 - 1e-3],
  ];
  for (const [name, c, x] of cases) {
    it(name, () => {
      const { provider, ages } = sharedAges(mulberry32(99), lifeZero(x));
      expect(compareWithEngine(c, ages, provider).map(formatMismatch)).toEqual([]);
    });
  }
});

describe('the path comparison is not vacuous', () => {
  it('the engine on sampled ages disagrees with the reference on median ages (one-truck, failing old engine)', () => {
    const c = referenceVariants().find((v) => v.name === 'failing old engine')!.caseFile;
    const { provider } = sharedAges(mulberry32(5));
    const mismatches = compareWithEngine(c, () => medianAges, provider);
    expect(mismatches.length).toBeGreaterThan(0);
  });
});

describe('what the reference itself does at those ties (MODEL.md §3, by hand)', () => {
  const one = variantOf(loadScenario('one-truck.json'), (c) => {
    c.assumptions.valuation = 'median-path';
  });
  // life 0 fails at x; later lives never within the horizon
  const ages = (x: number): AgeSource => (lifeIndex, _e, startAge) => (lifeIndex === 0 ? x : startAge + 1e9);
  it('rebuild, failure age = planned life (20,000 h) or 1e-7 h short: one overhaul in year 1, no repair, failureBeforePlanned 0', () => {
    for (const x of [20000, 20000 - 1e-7]) {
      const p = referencePath(one, 'T-01', 'rebuild', ages(x));
      expect(p.periods[1].events).toEqual({ overhauls: 1, repairs: 0, repowers: 0 });
      expect(p.failureBeforePlanned).toBe(0);
    }
  });
  it('rebuild, failure age 1e-3 h short of the planned life: one repair in year 1, failureBeforePlanned 1', () => {
    const p = referencePath(one, 'T-01', 'rebuild', ages(20000 - 1e-3));
    expect(p.periods[1].events).toEqual({ overhauls: 0, repairs: 1, repowers: 0 });
    expect(p.failureBeforePlanned).toBe(1);
  });
  it('keep, failure due exactly at the last hour of year 3 = N (34,500 h): no repair, the oil service at 34,500 h counted (24 in (28,500, 34,500])', () => {
    const p = referencePath(one, 'T-01', 'keep', ages(34500));
    expect(p.periods[3].events.repairs).toBe(0);
    expect(p.periods[3].oilServices).toBe(24);
    expect(p.failureBeforePlanned).toBe(0);
  });
  it('keep, failure 1e-3 h before that hour: the repair is booked in year 3 and includes the oil change (23 services)', () => {
    const p = referencePath(one, 'T-01', 'keep', ages(34500 - 1e-3));
    expect(p.periods[3].events.repairs).toBe(1);
    expect(p.periods[3].oilServices).toBe(23);
    expect(p.failureBeforePlanned).toBe(1);
  });
  it('repower, the old engine failing at 18,000 h: a failed swap in year 1 with the failed core credit and the longer downtime, no repair', () => {
    const c = variantOf(one, (c) => {
      c.repowerOffers[0].failedCoreCredit = 40000;
    });
    const p = referencePath(c, 'T-01', 'repower', ages(18000));
    expect(p.periods[1].events).toEqual({ overhauls: 0, repairs: 0, repowers: 1 });
    expect(p.periods[1].failures).toBe(0);
    // (1,500,000 + 140,000 − 40,000) at year-1 prices
    expect(p.periods[1].capital).toBeCloseTo(-1_600_000, 6);
    // max(2.5, 28) days · 6000/365 h · 850 t/h · 2.5 $/t
    expect(p.periods[1].lostMargin).toBeCloseTo(-28 * (6000 / 365) * 850 * 2.5, 6);
    expect(p.failureBeforePlanned).toBe(1);
  });
});

type CaseFileInputLike = ReturnType<typeof loadScenario>;
