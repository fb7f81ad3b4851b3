import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase } from '@/lib/engine';
import { plannedSwapHours, timingOption, timingOptions, timingRun, truckSetupOf } from '@/lib/engine/timing';
import { assembleCashFlows } from '@/lib/engine/cash-flow';
import type { CaseFileInput } from '@/lib/validation/case';
import { referencePath, type AgeSource } from '@/tests/support/reference-path';

const load = (f: string) => JSON.parse(readFileSync(path.join(process.cwd(), 'scenarios', f), 'utf8')) as CaseFileInput;
const oneTruck = load('one-truck.json');
const withValuation = (c: CaseFileInput, valuation: 'expected' | 'median-path'): CaseFileInput => ({ ...c, assumptions: { ...c.assumptions, valuation } });

/** A longer-lived truck (60,000 h: ten years) whose old engine fails often: k = 2 and delays fall inside the horizon. */
const longTruck = (): CaseFileInput => {
  const c = withValuation(oneTruck, 'expected');
  return {
    ...c,
    engines: c.engines.map((e) => (e.id === 'old-2000' ? { ...e, weibullShape: 2.2, weibullScaleHours: 21000 } : e)),
    trucks: c.trucks.map((t) => ({ ...t, remainingLifeHours: 60000 })),
  };
};

/** Mulberry32: a small seeded generator (common practice), so the sampled check is reproducible. */
function rng(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Weibull failure ages by inversion: X = η((a/η)^β − ln U)^(1/β) given survival to a (MODEL.md section 11's law). */
function sampledAges(next: () => number): AgeSource {
  return (_life, e, a) => e.weibullScaleHours * Math.pow(Math.pow(a / e.weibullScaleHours, e.weibullShape) - Math.log(1 - next()), 1 / e.weibullShape);
}

describe('timing options', () => {
  it('worked example: k = 1 on one-truck.json swaps after 3,500 h, in month 7 of period 1, for 1,540,000; k = 2 is past the horizon', () => {
    const setup = truckSetupOf(withValuation(oneTruck, 'expected'), 'T-01');
    const k1 = timingOption(setup, { kind: 'event', k: 1, delayMonths: 0 });
    expect(k1.swapHours).toBe(3500);
    expect(k1.swapMonth).toBe(7);
    expect(k1.swapPeriod).toBe(1);
    expect(k1.plannedCapital).toEqual([0, 1_540_000, 0, 0]);
    expect(timingOptions(setup).map((o) => o.key)).toEqual(['keep', 'rebuild', 'now', 'k1']);
    expect(plannedSwapHours(setup, 1, 6)).toBe(3500 + 3000);
  });

  for (const valuation of ['expected', 'median-path'] as const) {
    it(`k = 1, d = 0 is today's at-overhaul repower, every figure equal (${valuation}); keep, rebuild and now are the case's`, () => {
      const c = withValuation(oneTruck, valuation);
      const truck = evaluateCase(c).trucks[0];
      const setup = truckSetupOf(c, 'T-01');
      expect(timingOption(setup, { kind: 'event', k: 1, delayMonths: 0 }).result).toEqual(truck.options.repower);
      expect(timingOption(setup, { kind: 'keep', k: 0, delayMonths: 0 }).result).toEqual(truck.options.keep);
      expect(timingOption(setup, { kind: 'rebuild', k: 0, delayMonths: 0 }).result).toEqual(truck.options.rebuild);
      const now = { ...c, repowerOffers: c.repowerOffers.map((o) => ({ ...o, timing: 'now' as const })) };
      expect(timingOption(setup, { kind: 'now', k: 0, delayMonths: 0 }).result).toEqual(evaluateCase(now).trucks[0].options.repower);
    });
  }

  it('gives every option the same figures whether valued alone or after its siblings (the undelayed lives are shared)', () => {
    const c = longTruck();
    const all = timingOptions(truckSetupOf(c, c.trucks[0].id), { maxK: 3, maxDelayMonths: 3 });
    const general = all.filter((o) => o.kind === 'event' && (o.k > 1 || o.delayMonths > 0));
    expect(general.length).toBeGreaterThan(3);
    for (const o of general) {
      // a fresh setup: nothing shared with the options valued before
      const alone = timingOption(truckSetupOf(c, c.trucks[0].id), { kind: 'event', k: o.k, delayMonths: o.delayMonths });
      expect(alone.npv).toBe(o.npv);
      expect(alone.result.cashFlows).toEqual(o.result.cashFlows);
    }
  });

  it('the general scheme run for k = 1, d = 0 agrees with the engine within MODEL.md section 11 accuracy', () => {
    const c = longTruck();
    const setup = truckSetupOf(c, 'T-01');
    const engine = evaluateCase(c).trucks[0].options;
    const general = assembleCashFlows(setup, timingRun(setup, { kind: 'event', k: 1, delayMonths: 0 }, true));
    const tol = 1e-5 * (Math.abs(engine.rebuild.npv) + 1);
    expect(Math.abs(general.run.npv - engine.repower.npv)).toBeLessThan(tol);
    general.cashFlows.forEach((cf, y) => expect(Math.abs(cf - engine.repower.cashFlows[y])).toBeLessThan(tol));
  });

  for (const [name, spec] of [
    ['k = 2 (repower at the overhaul after next)', { k: 2, delayMonths: 0 }],
    ['k = 1 delayed 12 months', { k: 1, delayMonths: 12 }],
  ] as const) {
    it(`${name}: a plain sampled simulation converges to its expected npv (3 standard errors)`, () => {
      const c = longTruck();
      const setup = truckSetupOf(c, 'T-01');
      const option = timingOption(setup, { kind: 'event', ...spec });
      const next = rng(20261203 + spec.k * 7 + spec.delayMonths);
      const ages = sampledAges(next);
      const n = 4000;
      let sum = 0;
      let sq = 0;
      const delayHours = (spec.delayMonths * 6000) / 12;
      for (let i = 0; i < n; i++) {
        const v = referencePath(c, 'T-01', 'repower', ages, { k: spec.k, delayHours }).npv;
        sum += v;
        sq += v * v;
      }
      const mean = sum / n;
      const se = Math.sqrt((sq / n - mean * mean) / (n - 1));
      expect(se).toBeGreaterThan(0);
      expect(Math.abs(option.npv - mean)).toBeLessThan(3 * se);
      // and the option differs from the at-overhaul repower by more than the sampling error (the test has teeth)
      const k1 = timingOption(setup, { kind: 'event', k: 1, delayMonths: 0 }).npv;
      expect(Math.abs(k1 - mean)).toBeGreaterThan(3 * se);
    });
  }
});
