/**
 * MODEL.md section 3 (a repower brought forward by a failure) and section 5
 * (`lostMarginShare`) on the median path. Expected values are worked from
 * MODEL.md by hand in each test.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCaseDetailed, medianFailureAge } from '@/lib/engine';
import type { CaseFileInput } from '@/lib/validation/case';

const base: CaseFileInput = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));
const lostPerDay = (6000 / 365) * 850 * 2.5; // margin of a day down, year-1 prices

/** The one-truck case with an old engine that fails (median path) at 18,481 h, before its 20,000 h life. */
function failingCase(edit?: (c: CaseFileInput) => void): CaseFileInput {
  const c = structuredClone(base);
  c.assumptions.valuation = 'median-path';
  c.engines[0].weibullShape = 2;
  c.engines[0].weibullScaleHours = 10000;
  edit?.(c);
  return c;
}
const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(b)));

describe('a repower brought forward by a failure (MODEL.md section 3)', () => {
  // η((a0/η)^β + ln 2)^(1/β) = 10000·sqrt(1.65² + ln 2) = 18,481.4 h: 1,981 h into year 1
  const failAt = 10000 * Math.sqrt(1.65 ** 2 + Math.LN2);

  it('the old engine fails before its planned life on the median path', () => {
    close(medianFailureAge(16500, 2, 10000), failAt);
    expect(failAt).toBeLessThan(20000);
  });

  it('earns the failed core credit and is down the longer of the two downtimes; no repair is booked', () => {
    const c = failingCase((x) => (x.repowerOffers[0].failedCoreCredit = 40000));
    const { result, details } = evaluateCaseDetailed(c);
    const repower = details[0].policies.repower;
    const swap = repower.events[0];
    expect([swap.kind, swap.period, swap.unplanned]).toEqual(['repower', 1, true]);
    close(swap.hourOfYear, failAt - 16500);
    close(swap.cost, 1500000 + 140000 - 40000); // year-1 prices: index 1
    expect(swap.downtimeDays).toBe(28); // max(2.5 offer days, 28 failure days)
    const y1 = result.trucks[0].options.repower.breakdown[1];
    close(y1.capital, -1600000);
    close(y1.failures, 0);
    close(y1.lostMargin, -28 * lostPerDay);
    expect(result.trucks[0].options.repower.failureBeforePlanned).toBe(1);
  });

  it('without a failed core credit the offer\'s core credit applies', () => {
    const { details } = evaluateCaseDetailed(failingCase());
    close(details[0].policies.repower.events[0].cost, 1540000);
  });

  it('a planned repower keeps the core credit and the offer\'s own days', () => {
    const c = structuredClone(base);
    c.repowerOffers[0].failedCoreCredit = 40000;
    const { result, details } = evaluateCaseDetailed(c);
    const swap = details[0].policies.repower.events[0];
    expect(swap.unplanned).toBeUndefined();
    close(swap.cost, 1540000 * 1.025 ** 0); // at 20,000 h: 3,500 h into year 1
    expect(swap.downtimeDays).toBe(2.5);
    expect(result.trucks[0].options.repower.failureBeforePlanned).toBe(0);
  });
});

describe('lostMarginShare (MODEL.md section 5)', () => {
  it('costs only that share of each day down', () => {
    const half = failingCase((x) => (x.assumptions.lostMarginShare = 0.5));
    const r = evaluateCaseDetailed(half).result.trucks[0].options;
    close(r.rebuild.breakdown[1].lostMargin, -0.5 * 28 * lostPerDay); // the repair in year 1
    close(r.repower.breakdown[1].lostMargin, -0.5 * 28 * lostPerDay); // the failed swap
    const none = evaluateCaseDetailed(failingCase((x) => (x.assumptions.lostMarginShare = 0))).result.trucks[0].options;
    for (const p of [none.keep, none.rebuild, none.repower]) for (const b of p.breakdown) expect(b.lostMargin).toBe(0);
  });
});

describe('bad input of the new fields (MODEL.md section 9)', () => {
  it('refuses an unknown valuation, lostMarginShare outside [0, 1] and a negative failedCoreCredit with their paths', async () => {
    const { validateCase } = await import('@/lib/validation/case');
    const c = structuredClone(base) as unknown as Record<string, any>;
    c.assumptions.valuation = 'best-case';
    c.assumptions.lostMarginShare = 1.5;
    c.repowerOffers[0].failedCoreCredit = -1;
    const v = validateCase(c);
    expect(v.ok).toBe(false);
    const paths = v.ok ? [] : v.problems.map((p) => p.path);
    expect(paths).toEqual(expect.arrayContaining(['assumptions.valuation', 'assumptions.lostMarginShare', 'repowerOffers[0].failedCoreCredit']));
    c.assumptions.valuation = 'expected';
    c.assumptions.lostMarginShare = -0.1;
    c.repowerOffers[0].failedCoreCredit = 2000000; // above price + install
    const w = validateCase(c);
    expect(w.ok ? [] : w.problems.map((p) => p.path)).toEqual(expect.arrayContaining(['assumptions.lostMarginShare', 'repowerOffers[0].failedCoreCredit']));
  });

  it('a case without valuation is evaluated as expected (the default)', async () => {
    const { validateCase } = await import('@/lib/validation/case');
    const c = structuredClone(base);
    delete c.assumptions.valuation;
    const v = validateCase(c);
    expect(v.ok && v.value.assumptions.valuation).toBe('expected');
  });
});
