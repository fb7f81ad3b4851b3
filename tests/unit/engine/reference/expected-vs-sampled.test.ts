/**
 * Exercises the expected-vs-sampled check (tests/support/expected-vs-sampled.ts)
 * where its answer is known exactly: with every engine's Weibull scale at
 * 1,000,000 h and shape 20, P(X < 100,000 h) = 0.1^20 = 1e-20, so no engine
 * fails within any horizon here, every sampled path is the median path, and
 * the engine's median path (MODEL.md section 3) must match the sampled
 * means to 1e-9 with standard errors of 0. And where the answer is known to
 * be "different": the median path of a failing engine is not its expectation.
 *
 * The real check of the engine's expected valuation (MODEL.md section 11)
 * calls `checkExpectedAgainstSampled(name, case, iterations, seed)` with the
 * default valuation 'expected'; see the helper's header for how.
 */
import { describe, expect, it } from 'vitest';
import { checkExpectedAgainstSampled, formatExpectedMismatch } from '@/tests/support/expected-vs-sampled';
import { referenceVariants, variantOf } from '@/tests/support/reference-variants';

const noFailures = (c: Record<string, any>) => { // eslint-disable-line @typescript-eslint/no-explicit-any
  for (const e of c.engines) {
    e.weibullScaleHours = 1_000_000;
    e.weibullShape = 20;
  }
};

describe('checkExpectedAgainstSampled on cases where the expectation is the median path', () => {
  for (const v of referenceVariants()) {
    it(`${v.name} (${v.source}) with failures pushed beyond the horizon`, () => {
      const c = variantOf(v.caseFile, noFailures);
      const bad = checkExpectedAgainstSampled(v.name, c, 20, 42, {
        valuation: 'median-path',
        modelAccuracy: false, // exact: no allowance for the engine's permitted error
        rareEvents: false,
      });
      expect(bad.map(formatExpectedMismatch)).toEqual([]);
    });
  }
});

describe('checkExpectedAgainstSampled finds a real difference', () => {
  it('failing old engine (scale 10,000 h, shape 2): the median path is not the expectation', () => {
    const v = referenceVariants().find((x) => x.name === 'failing old engine')!;
    const bad = checkExpectedAgainstSampled(v.name, v.caseFile, 400, 42, { valuation: 'median-path' });
    // rebuild on the median path fails at 18,481 h, before the 20,000 h life (failureBeforePlanned 1);
    // sampled, with probability P(X < 20000 | X > 16500) = 1 − exp(−(2² − 1.65²)) ≈ 0.721 (MODEL.md §11)
    const fbp = bad.find((m) => m.policy === 'rebuild' && m.what === 'failureBeforePlanned');
    expect(fbp?.engine).toBe(1);
    expect(Math.abs(fbp!.sampledMean - (1 - Math.exp(-(4 - 1.65 * 1.65))))).toBeLessThan(4 * fbp!.se);
  });
});
