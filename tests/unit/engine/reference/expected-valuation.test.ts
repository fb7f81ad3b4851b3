/**
 * The engine's expected valuation (MODEL.md section 11) against an
 * independent route: the plain, slow, sampled reference of
 * tests/support/reference-path.ts (written from MODEL.md sections 2–8, not
 * from lib/engine), averaged over Weibull failure ages drawn by its own
 * generator. Every per-period amount, count, quantity, npv and
 * failureBeforePlanned must agree within 4 standard errors (4, not 3: each
 * variant makes thousands of comparisons, and at 3 about 0.3 % of honest ones
 * fall outside; see tests/support/expected-vs-sampled.ts), plus MODEL.md's
 * stated accuracy. Fixed seed: reproducible.
 */
import { describe, expect, it } from 'vitest';
import { checkExpectedAgainstSampled, formatExpectedMismatch } from '@/tests/support/expected-vs-sampled';
import { referenceVariants } from '@/tests/support/reference-variants';

describe('expected valuation = mean of the independent sampled reference', () => {
  for (const v of referenceVariants()) {
    it(v.name, () => {
      const n = v.name === 'aldervane-north-pit' ? 2000 : 10000;
      const bad = checkExpectedAgainstSampled(v.name, v.caseFile, n, 12345, { sigmas: 4 });
      expect(bad.map(formatExpectedMismatch)).toEqual([]);
    }, 120_000);
  }

  it('catches a valuation that is not the expectation: the median path fails the same check', () => {
    const v = referenceVariants().find((x) => x.name === 'aldervane-north-pit') ?? referenceVariants()[0];
    const bad = checkExpectedAgainstSampled(v.name, v.caseFile, 2000, 12345, { sigmas: 4, valuation: 'median-path' });
    expect(bad.length).toBeGreaterThan(10);
  }, 120_000);
});
