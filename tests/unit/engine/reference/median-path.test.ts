/**
 * The reference path (tests/support/reference-path.ts, written from MODEL.md
 * sections 2–8 alone) with the median failure ages of MODEL.md section 3 —
 * η((a0/η)^β + ln 2)^(1/β) for the engine fitted at the start, η(ln 2)^(1/β)
 * for a fresh life — against `evaluateCase` with `valuation: 'median-path'`:
 * every cash flow, breakdown category, event count, per-period quantity, npv
 * and failureBeforePlanned to 1e-6 relative (MODEL.md preamble).
 */
import { describe, expect, it } from 'vitest';
import { compareWithEngine, formatMismatch } from '@/tests/support/reference-compare';
import { medianAges, refMedianAge } from '@/tests/support/reference-path';
import { referenceVariants, variantOf } from '@/tests/support/reference-variants';

describe('reference path with median ages agrees with the engine median path (MODEL.md §§2–8, §3 medians)', () => {
  for (const variant of referenceVariants()) {
    it(`${variant.name} (${variant.source})`, () => {
      const mismatches = compareWithEngine(variant.caseFile, () => medianAges);
      expect(mismatches.map(formatMismatch)).toEqual([]);
    });
  }

  it('the failing old engine variant fails at 18,481 h (MODEL.md §3 conditional median, by hand: 10000·√(1.65² + ln 2))', () => {
    const age = refMedianAge(
      { weibullShape: 2, weibullScaleHours: 10000 } as Parameters<typeof refMedianAge>[0],
      16500,
    );
    expect(age).toBeCloseTo(10000 * Math.sqrt(1.65 * 1.65 + Math.LN2), 9);
    expect(Math.round(age)).toBe(18481);
  });
});

describe('hours within 1e-6 h on the time grid (MODEL.md preamble ε rule, §2 N and H_y, §3 "at or past its planned life")', () => {
  // [annualHours, remainingLifeHours, engineHours]: a last year of ≤ 1e-6 h is no year; an engine within 1e-6 h of its life is at it
  const edges: [number, number, number][] = [
    [6150.7, 43055, 0],
    [5999.9, 18000, 16500],
    [6000, 18000.0000004, 16500],
    [6000, 18000.0000011, 16500],
    [6000, 18000.00001, 16500],
    [3333.3333333, 10000, 16666.6666667],
    [3500, 7000.0000005, 16500],
    [3500, 6999.9999995, 16500],
    [3500.0000004, 7000, 16500],
    [6000, 18000, 19999.9999995],
    [6000, 18000, 19999.999],
    [6000, 6000.0000005, 16500],
    [6000, 5999.9999995, 16500],
  ];
  const one = referenceVariants()[0].caseFile;
  for (const [annualHours, remainingLifeHours, engineHours] of edges) {
    it(`annual ${annualHours} h, remaining ${remainingLifeHours} h, engine at ${engineHours} h`, () => {
      const c = variantOf(one, (c) => Object.assign(c.trucks[0], { annualHours, remainingLifeHours, engineHours }));
      expect(compareWithEngine(c, () => medianAges).map(formatMismatch)).toEqual([]);
    });
  }
});
