/**
 * Time value of money: present value, annuities, MIRR and payback.
 * IRR, which needs a root search, lives in irr.ts.
 *
 * Conventions (MODEL.md sections 2 and 8): `values[t]` is the cash flow at the
 * end of period t, `values[0]` today (not discounted). Cash in is positive,
 * cash out negative. Rates are fractions per period (0.08 = 8 %).
 */
import { npv as financialNpv, pmt as financialPmt } from 'financial';

/** Magnitudes below this count as zero wherever MODEL.md compares with zero. */
export const ZERO = 1e-6;

/** `|x| < 1e-6` (MODEL.md: "a difference or amount whose magnitude is below 1e-6 counts as zero"). */
export function isZero(x: number): boolean {
  return Math.abs(x) < ZERO;
}

/**
 * Net present value with the first value at t = 0:
 * NPV = Σ_t values[t] / (1 + rate)^t.
 *
 * Unlike the spreadsheet NPV (which discounts its first value one period),
 * this is numpy-financial's convention, computed by the `financial` package.
 * Rate 0 gives the plain sum.
 *
 * @example npv(0.08, [-40000, 5000, 8000, 12000, 30000]) // ≈ 3065.22267
 */
export function npv(rate: number, values: readonly number[]): number {
  return financialNpv(rate, values as number[]);
}

/**
 * Present value of 1 due at time t: (1 + rate)^−t. t may be fractional
 * (mid-year timing uses t − 0.5).
 *
 * @example discountFactor(0.08, 2) // ≈ 0.857339
 */
export function discountFactor(rate: number, t: number): number {
  return Math.pow(1 + rate, -t);
}

/**
 * Capital recovery factor (A/P, i, n) = i(1+i)^n / ((1+i)^n − 1): the
 * end-of-year annuity over n years worth 1 today. Rate 0 gives 1/n.
 * Uses expm1/log1p so that rates near zero keep their precision.
 *
 * @example capitalRecoveryFactor(0.15, 5) // ≈ 0.298316
 */
export function capitalRecoveryFactor(rate: number, years: number): number {
  if (!(years > 0)) throw new RangeError('capitalRecoveryFactor: years must be > 0');
  if (rate === 0) return 1 / years;
  const growth = Math.expm1(years * Math.log1p(rate)); // (1+i)^n − 1
  return (rate * (growth + 1)) / growth;
}

/**
 * Capital recovery cost of an asset: CR = (P − S)(A/P, i, n) + S·i, the
 * equal end-of-year amount over n years that recovers price P less salvage
 * S at rate i (Blank & Tarquin, Engineering Economy). Positive: a cost.
 *
 * @example capitalRecovery(50000, 5000, 5, 0.10) // ≈ 12370.89
 */
export function capitalRecovery(price: number, salvage: number, years: number, rate: number): number {
  return (price - salvage) * capitalRecoveryFactor(rate, years) + salvage * rate;
}

/**
 * Equivalent annual worth of cash flows `values` (values[0] at t = 0):
 * EAW = NPV · (A/P, rate, N) with N = values.length − 1. Positive: a gain.
 *
 * @example equivalentAnnualWorth([-27000, 7000, 7000, 7000, 7000, 17000], 0.15) // ≈ 428.6
 */
export function equivalentAnnualWorth(values: readonly number[], rate: number): number {
  return npv(rate, values) * capitalRecoveryFactor(rate, values.length - 1);
}

/**
 * Equivalent annual cost of a (negative) npv over N years:
 * EAC = −npv · r(1+r)^N / ((1+r)^N − 1); −npv / N when r = 0.
 * An end-of-year annuity whatever the case's timing. Positive: a cost.
 *
 * @example equivalentAnnualCost(-1000, 0, 4) // = 250
 */
export function equivalentAnnualCost(npvValue: number, rate: number, years: number): number {
  return -npvValue * capitalRecoveryFactor(rate, years);
}

/**
 * Payment per period of a loan (spreadsheet PMT / numpy-financial `pmt`),
 * by the `financial` package: pv + pmt·annuity + fv discounted = 0, so a
 * positive loan gives a negative payment. Rate 0 gives −(pv + fv)/nper.
 *
 * @example pmt(0.075 / 12, 180, 200000) // ≈ -1854.0247200054619
 */
export function pmt(rate: number, periods: number, presentValue: number, futureValue = 0): number {
  return financialPmt(rate, periods, presentValue, futureValue);
}

/**
 * Modified internal rate of return, as the spreadsheet MIRR:
 * (FV at reinvestRate of the positive flows / −PV at financeRate of the
 * negative flows)^(1/N) − 1, N = values.length − 1, end-of-year powers.
 * Flows of magnitude below 1e-6 count as neither. Returns null when there is
 * no positive or no negative flow (the spreadsheet's #DIV/0!).
 *
 * @example mirr([-100, 50, -60, 70], 0.10, 0.12) // ≈ -0.03909366594356467
 */
export function mirr(values: readonly number[], financeRate: number, reinvestRate: number): number | null {
  const n = values.length - 1;
  if (n < 1) return null;
  let fvPositive = 0;
  let pvNegative = 0;
  for (let t = 0; t <= n; t++) {
    const v = values[t];
    if (v >= ZERO) fvPositive += v * Math.pow(1 + reinvestRate, n - t);
    else if (v <= -ZERO) pvNegative += v / Math.pow(1 + financeRate, t);
  }
  if (fvPositive === 0 || pvNegative === 0) return null;
  return Math.pow(fvPositive / -pvNegative, 1 / n) - 1;
}

/** Index of the first flow with |x| ≥ 1e-6, or −1 when all count as zero. */
export function firstNonZero(values: readonly number[]): number {
  for (let t = 0; t < values.length; t++) if (!isZero(values[t])) return t;
  return -1;
}

/**
 * Payback in years (MODEL.md section 8), counted from the investment at
 * period s (the first flow that is not zero, unless given):
 * for the first y > s with cum_y ≥ 0, (y − s − 1) + (−cum_{y−1}) / values[y],
 * linear within the year; 0 if values[s] > 0 or every flow is zero; null if
 * the running sum never comes back to zero. cum_y ≥ 0 uses the 1e-6 rule.
 * For a discounted payback pass the discounted flows (values[t]·DF_t).
 *
 * @example paybackYears([-1000, 400, 400, 400]) // = 2.5
 */
export function paybackYears(values: readonly number[], start?: number): number | null {
  const s = start ?? firstNonZero(values);
  if (s < 0) return 0;
  if (values[s] > 0) return 0;
  let cum = values[s];
  for (let y = s + 1; y < values.length; y++) {
    const previous = cum;
    cum += values[y];
    if (cum > -ZERO) return y - s - 1 + -previous / values[y];
  }
  return null;
}

/**
 * Number of sign changes in the flows, flows of magnitude below 1e-6 skipped
 * (MODEL.md `irrSignChanges`).
 *
 * @example countSignChanges([-100, 0, 50, -10, 20]) // = 3
 */
export function countSignChanges(values: readonly number[]): number {
  let changes = 0;
  let last = 0;
  for (const v of values) {
    if (isZero(v)) continue;
    const sign = v > 0 ? 1 : -1;
    if (last !== 0 && sign !== last) changes++;
    last = sign;
  }
  return changes;
}
