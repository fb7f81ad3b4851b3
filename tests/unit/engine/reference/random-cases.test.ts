/**
 * The reference path (MODEL.md sections 2–8) against the engine on random
 * cases: one-truck.json with its figures drawn at random within plausible
 * ranges (hours, lives, intervals, Weibull laws, timing, horizon cap, tax,
 * depreciation method and accounting, offer timing, failed core credit,
 * productivity gain, lostMarginShare, measured burn), each on the median
 * path (MODEL.md §3) and on one path of sampled Weibull ages (§11).
 */
import { describe, expect, it } from 'vitest';
import type { FailureAgeProvider } from '@/lib/engine';
import { compareWithEngine, formatMismatch } from '@/tests/support/reference-compare';
import { mulberry32, weibullAgeFromUniform } from '@/tests/support/reference-expectation';
import { medianAges, type AgeSource, type RefPolicy } from '@/tests/support/reference-path';
import { loadScenario, variantOf } from '@/tests/support/reference-variants';

const CASES = 1000;

function randomCase(seed: number) {
  const u = mulberry32(seed);
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(u() * xs.length)];
  const between = (a: number, b: number) => a + (b - a) * u();
  const round = (x: number, step: number) => Math.max(step, Math.round(x / step) * step);
  return variantOf(loadScenario('one-truck.json'), (c) => {
    const a = c.assumptions;
    a.valuation = 'median-path';
    a.discountRate = pick([0, 0.05, 0.08, 0.12]);
    a.timing = pick(['end-of-year', 'mid-year']);
    a.horizonYears = pick([null, null, 1, 3, 6]);
    a.inflation = pick([0, 0.025, 0.05]);
    a.fuelEscalation = pick([0, 0.03]);
    a.carbonPrice = pick([0, 25]);
    a.carbonEscalation = pick([0, 0.04]);
    a.taxRate = pick([0, 0.3]);
    a.rebuildAccounting = pick(['expense', 'capitalise']);
    a.depreciation = pick([
      { method: 'none' },
      { method: 'straight-line', years: pick([1, 5, 10]) },
      { method: 'declining-balance', years: pick([4, 7]), factor: pick([1.5, 2]) },
      { method: 'macrs', years: pick([3, 5, 7, 10, 15, 20]) },
    ]);
    a.lostMarginShare = pick([1, 0.5, 0]);
    for (const e of c.engines) {
      e.lifeHours = round(between(8000, 30000), 500);
      e.weibullScaleHours = round(between(6000, 40000), 100);
      e.weibullShape = pick([1, 1.5, 2, 3.2, 5]);
      e.serviceIntervalHours = pick([250, 500, 1000, 2000]);
    }
    const o = c.repowerOffers[0];
    o.timing = pick(['at-overhaul', 'at-overhaul', 'now']);
    o.productivityGain = pick([0, 0.01, 0.03]);
    if (u() < 0.5) o.failedCoreCredit = pick([0, 40000]);
    const t = c.trucks[0];
    t.annualHours = round(between(3000, 7000), 50);
    t.remainingLifeHours = round(between(2000, 70000), 250);
    t.engineHours = round(between(0, 32000), 250);
    t.fuelBurnLitresPerHour = u() < 0.3 ? round(between(150, 350), 0.5) : null;
  });
}

describe('reference path agrees with the engine on random cases (MODEL.md §§2–8)', () => {
  it(`${CASES} random one-truck cases, median path and one sampled path each`, () => {
    const problems: string[] = [];
    for (let i = 0; i < CASES && problems.length < 20; i++) {
      const c = randomCase(31337 + i);
      for (const m of compareWithEngine(c, () => medianAges)) problems.push(`case ${i} median: ${formatMismatch(m)}`);
      const uniform = mulberry32(4242 + i);
      const memo = new Map<string, number>();
      const get = (policy: string, lifeIndex: number, engine: Parameters<AgeSource>[1], startAge: number) => {
        const key = `${policy}|${lifeIndex}|${engine.id}|${startAge}`;
        if (!memo.has(key)) memo.set(key, weibullAgeFromUniform(engine, startAge, uniform()));
        return memo.get(key)!;
      };
      const provider: FailureAgeProvider = (ctx) => get(ctx.policy, ctx.lifeIndex, ctx.engine, ctx.startAge);
      const ages = (_t: string, policy: RefPolicy): AgeSource => (li, e, s) => get(policy, li, e, s);
      for (const m of compareWithEngine(c, ages, provider)) problems.push(`case ${i} sampled: ${formatMismatch(m)}`);
    }
    expect(problems).toEqual([]);
  });
});
