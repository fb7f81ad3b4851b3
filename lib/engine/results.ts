/**
 * Per-policy results, the three comparisons and `best` (MODEL.md section 8).
 */
import { irr } from './irr';
import {
  countSignChanges,
  equivalentAnnualCost,
  firstNonZero,
  isZero,
  mirr,
  paybackYears,
  ZERO,
} from './time-value';
import type { PolicyCash } from './cash-flow';
import { countEvents } from './simulate';
import { POLICIES, type Comparison, type PolicyKey, type PolicyResult } from './types';

/**
 * Results of one policy from its cash flows.
 * - npv = Σ CF_y·DF_y (negative: a cost), as the simulation summed it by kind
 *   (`npvFromTotals`: the same sum regrouped; equal to the table's within rounding)
 * - eac = −npv·(A/P, r, N) (an end-of-year annuity whatever the timing; −npv/N at r = 0)
 * - costPerHour = −(npv − PV of the after-tax extra margin) / Σ H_y·DF_y; costPerTonne on Σ tonnes_y·DF_y
 */
export function policyResult(cash: PolicyCash, discountFactors: ArrayLike<number>, discountRate: number, taxRate: number): PolicyResult {
  const n = cash.n;
  const periods = cash.run.periods;
  const npv = cash.run.npv;
  let pvExtra = 0;
  let pvHours = 0;
  let pvTonnes = 0;
  let fuelLitres = 0;
  let co2 = 0;
  let tonnes = 0;
  let hours = 0;
  for (let y = 0; y <= n; y++) {
    const p = periods[y];
    const df = discountFactors[y];
    pvExtra += (1 - taxRate) * cash.breakdown[y].extraMargin * df;
    pvHours += p.hours * df;
    pvTonnes += p.tonnes * df;
    fuelLitres += p.fuelLitres;
    co2 += cash.co2Tonnes[y];
    tonnes += p.tonnes;
    hours += p.hours;
  }
  const levelised = -(npv - pvExtra);
  return {
    npv,
    eac: equivalentAnnualCost(npv, discountRate, n),
    costPerHour: levelised / pvHours,
    costPerTonne: levelised / pvTonnes,
    fuelLitres,
    co2Tonnes: co2,
    tonnes,
    hours,
    fuelLitresPerHour: fuelLitres / hours,
    cashFlows: cash.cashFlows,
    breakdown: cash.breakdown,
    events: cash.run.eventCounts ?? countEvents(cash.run.log, n),
    failureBeforePlanned: cash.run.failureBeforePlanned,
  };
}

/**
 * Compare policy `first` with `second` on ΔCF_y = CF_y(first) − CF_y(second).
 * `firstCapital` is the first policy's `capital` category by period (negative).
 */
export function comparePolicies(
  first: readonly number[],
  second: readonly number[],
  discountFactors: ArrayLike<number>,
  discountRate: number,
  firstCapital: readonly number[],
): Comparison {
  const n = first.length - 1;
  const delta = new Array<number>(n + 1);
  const discounted = new Array<number>(n + 1);
  let deltaNpv = 0;
  let pvCapital = 0;
  for (let y = 0; y <= n; y++) {
    delta[y] = first[y] - second[y];
    discounted[y] = delta[y] * discountFactors[y];
    deltaNpv += discounted[y];
    pvCapital -= firstCapital[y] * discountFactors[y];
  }
  const s = firstNonZero(delta);
  return {
    deltaNpv,
    irr: irr(delta),
    irrSignChanges: countSignChanges(delta),
    mirr: mirr(delta, discountRate, discountRate),
    paybackYears: paybackYears(delta, s),
    discountedPaybackYears: paybackYears(discounted, s),
    profitabilityIndex: isZero(pvCapital) ? null : 1 + deltaNpv / pvCapital,
  };
}

/**
 * The policy with the highest npv. Policies whose npv is within 1e-6 of the
 * highest tie with it, and ties go to rebuild, then keep, then repower.
 *
 * @example bestPolicy({ keep: -10, rebuild: -10 + 5e-7, repower: -20 }) // = 'rebuild'
 */
export function bestPolicy(npvs: Record<PolicyKey, number>): PolicyKey {
  return POLICIES[bestPolicyIndex(npvs.keep, npvs.rebuild, npvs.repower)];
}

/**
 * `bestPolicy` as an index into POLICIES (0 keep, 1 rebuild, 2 repower), from
 * three numbers: what Monte Carlo's summaries ask per truck and iteration.
 *
 * @example bestPolicyIndex(-10, -10 + 5e-7, -20) // = 1 (rebuild)
 */
export function bestPolicyIndex(keep: number, rebuild: number, repower: number): 0 | 1 | 2 {
  const floor = Math.max(keep, rebuild, repower) - ZERO;
  if (rebuild > floor) return 1;
  if (keep > floor) return 0;
  if (repower > floor) return 2;
  return 1; // NaN somewhere: rebuild, as a tie would
}
