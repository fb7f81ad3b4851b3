/**
 * Time-value functions against published values (shared/CHECKS.md). Every
 * expected number below comes from the source named beside it.
 */
import { describe, expect, it } from 'vitest';
import {
  capitalRecovery,
  capitalRecoveryFactor,
  countSignChanges,
  equivalentAnnualCost,
  equivalentAnnualWorth,
  irr,
  mirr,
  npv,
  paybackYears,
  pmt,
  discountFactor,
} from '@/lib/engine';

describe('npv (values[0] at t = 0)', () => {
  it('matches the spreadsheet NPV example when its first-discounted flows are shifted one period', () => {
    // Microsoft Excel NPV function help, example 1: NPV(10%, -10000, 3000, 4200, 6800) = 1,188.44
    // (the spreadsheet discounts its first value one period, so a 0 goes in front here)
    expect(npv(0.1, [0, -10000, 3000, 4200, 6800])).toBeCloseTo(1188.44, 2);
  });

  it('matches the spreadsheet NPV example with the investment added at t = 0', () => {
    // Microsoft Excel NPV function help, example 2: NPV(8%, 8000, 9200, 10000, 12000, 14500) + (-40000) = 1,922.06
    expect(npv(0.08, [-40000, 8000, 9200, 10000, 12000, 14500])).toBeCloseTo(1922.06, 2);
  });

  it('matches the numpy-financial npv docstring', () => {
    // numpy-financial `npv` docstring: npv(0.08, [-40_000, 5_000, 8_000, 12_000, 30_000]) ≈ 3065.22267
    expect(npv(0.08, [-40000, 5000, 8000, 12000, 30000])).toBeCloseTo(3065.22267, 5);
  });

  it('matches the numpy-financial npv test', () => {
    // numpy-financial tests: npv(0.05, [-15000, 1500, 2500, 3500, 4500, 6000]) = 122.89 (2 decimals)
    expect(npv(0.05, [-15000, 1500, 2500, 3500, 4500, 6000])).toBeCloseTo(122.89, 2);
  });

  it('is the plain sum at rate 0', () => {
    // common practice, no source: (1+0)^-t = 1
    expect(npv(0, [-100, 30, 30, 40])).toBe(0);
  });

  it('discountFactor is (1+r)^-t, fractional t allowed (mid-year)', () => {
    expect(discountFactor(0.08, 2)).toBeCloseTo(1 / 1.1664, 12);
    expect(discountFactor(0.08, 0.5)).toBeCloseTo(1 / Math.sqrt(1.08), 12);
  });
});

describe('irr (MODEL.md: the unique rate in (-0.99, 10), investment first)', () => {
  it('matches the spreadsheet IRR example, five years and four years', () => {
    // Microsoft Excel IRR function help: IRR(A2:A7) = 8.66 %, IRR(A2:A6) = -2.12 %
    expect(irr([-70000, 12000, 15000, 18000, 21000, 26000])).toBeCloseTo(0.0866, 4);
    expect(irr([-70000, 12000, 15000, 18000, 21000])).toBeCloseTo(-0.0212, 4);
  });

  it('matches the numpy-financial irr docstring', () => {
    // numpy-financial `irr` docstring: irr([-100, 39, 59, 55, 20]) ≈ 0.28095
    expect(irr([-100, 39, 59, 55, 20])).toBeCloseTo(0.28095, 5);
  });

  it('matches the numpy-financial irr test', () => {
    // numpy-financial tests: irr([-150000, 15000, 25000, 35000, 45000, 60000]) ≈ 0.0524 (4 decimals)
    expect(irr([-150000, 15000, 25000, 35000, 45000, 60000])).toBeCloseTo(0.0524, 4);
  });

  it('satisfies npv(irr(x), x) = 0 on the published flows', () => {
    // numpy-financial tests (congruence): npv(irr(x), x) = 0 for flows with one sign change, to 1e-9
    for (const x of [
      [-100, 39, 59, 55, 20],
      [-150000, 15000, 25000, 35000, 45000, 60000],
      [-70000, 12000, 15000, 18000, 21000, 26000],
    ]) {
      const rate = irr(x);
      expect(rate).not.toBeNull();
      expect(Math.abs(npv(rate as number, x))).toBeLessThan(1e-9);
    }
  });

  it('is null when the first flow is a gain (no investment first)', () => {
    expect(irr([100, -39, -59, -55, -20])).toBeNull();
  });

  it('is null when every flow is zero, or when there is no sign change', () => {
    expect(irr([0, 0, 0])).toBeNull();
    expect(irr([-100, -10, -5])).toBeNull();
  });

  it('is null when two rates solve the flows (read MIRR instead)', () => {
    // -100, +230, -132 = -(1 - 1.1x)(1 - 1.2x)·100 with x = 1/(1+i): rates 10 % and 20 %
    expect(countSignChanges([-100, 230, -132])).toBe(2);
    expect(irr([-100, 230, -132])).toBeNull();
  });

  it('finds a rate of exactly 0 when the flows sum to zero (rate 0 is an ordinary step)', () => {
    expect(irr([-100, 50, 50])).toBe(0);
  });

  it('ignores a root beyond the grid (rate above 10)', () => {
    // -1 + 20/(1+i) = 0 → i = 19, outside (-0.99, 10)
    expect(irr([-1, 20])).toBeNull();
  });
});

describe('mirr (spreadsheet MIRR)', () => {
  it('matches the numpy-financial mirr test', () => {
    // numpy-financial tests: mirr([-4500, -800, 800, 800, 600, 600, 800, 800, 700, 3000], 0.08, 0.055) ≈ 0.0666
    expect(mirr([-4500, -800, 800, 800, 600, 600, 800, 800, 700, 3000], 0.08, 0.055)).toBeCloseTo(0.0666, 4);
  });

  it('matches the numpy-financial mirr docstring', () => {
    // numpy-financial `mirr` docstring: mirr([-100, 50, -60, 70], 0.10, 0.12) = -0.03909366594356467
    expect(mirr([-100, 50, -60, 70], 0.1, 0.12)).toBeCloseTo(-0.03909366594356467, 12);
  });

  it('is null without a positive or without a negative flow', () => {
    expect(mirr([-100, -50], 0.1, 0.1)).toBeNull();
    expect(mirr([100, 50], 0.1, 0.1)).toBeNull();
  });
});

describe('pmt and capital recovery', () => {
  it('matches the spreadsheet PMT example', () => {
    // Microsoft Excel PMT function help: PMT(8%/12, 10, 10000) = -1,037.03
    expect(pmt(0.08 / 12, 10, 10000)).toBeCloseTo(-1037.03, 2);
  });

  it('matches the numpy-financial pmt docstring', () => {
    // numpy-financial `pmt` docstring: pmt(0.075/12, 12*15, 200000) = -1854.0247200054619
    expect(pmt(0.075 / 12, 180, 200000)).toBeCloseTo(-1854.0247200054619, 9);
  });

  it('gives the capital recovery of a textbook asset', () => {
    // standard formula (P−S)(A/P,i,n) + S·i, e.g. Blank & Tarquin, Engineering Economy; value recomputed: 12,370.89
    expect(capitalRecovery(50000, 5000, 5, 0.1)).toBeCloseTo(12370.89, 2);
  });

  it('gives the equivalent annual worth of a defender/challenger difference', () => {
    // White et al., Principles of Engineering Economic Analysis, 5th ed., Example 11.10: 428.6 a year for replacing
    expect(equivalentAnnualWorth([-27000, 7000, 7000, 7000, 7000, 17000], 0.15)).toBeCloseTo(428.6, 1);
  });

  it('capital recovery factor is 1/n at rate 0 and continuous near 0', () => {
    // common practice, no source: the annuity of 1 over n years at 0 % is 1/n
    expect(capitalRecoveryFactor(0, 4)).toBe(0.25);
    expect(capitalRecoveryFactor(1e-12, 4)).toBeCloseTo(0.25, 10);
  });

  it('EAC of an npv is -npv·(A/P): rate 0 gives -npv/N', () => {
    expect(equivalentAnnualCost(-1000, 0, 4)).toBe(250);
    expect(equivalentAnnualCost(-1000, 0.1, 1)).toBeCloseTo(1100, 9);
  });
});

describe('payback (MODEL.md section 8)', () => {
  it('is linear within the year the running sum turns non-negative', () => {
    // -1000, 400, 400, 400: cum -600, -200, +200 → 2 + 200/400 = 2.5
    expect(paybackYears([-1000, 400, 400, 400])).toBe(2.5);
  });

  it('counts from the first period that is not zero', () => {
    // investment in period 2: -1000 at s = 2, then +500, +500 → (4 − 2 − 1) + 500/500 = 2
    expect(paybackYears([0, 0, -1000, 500, 500])).toBe(2);
  });

  it('is 0 for a gain first or all-zero flows, null if never paid back', () => {
    expect(paybackYears([100, -50])).toBe(0);
    expect(paybackYears([0, 0])).toBe(0);
    expect(paybackYears([-1000, 100, 100])).toBeNull();
  });

  it('treats a running sum within 1e-6 of zero as paid back', () => {
    expect(paybackYears([-1000, 999.9999995])).toBeCloseTo(1, 6);
  });
});

describe('countSignChanges', () => {
  it('skips zero entries and entries below 1e-6', () => {
    expect(countSignChanges([-100, 0, 50, -10, 20])).toBe(3);
    expect(countSignChanges([-100, 5e-7, -1e-7, 50])).toBe(1);
  });
});
