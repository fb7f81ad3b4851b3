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
import { referenceVariants } from '@/tests/support/reference-variants';

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
