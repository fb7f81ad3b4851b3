/**
 * The decision summary: what an approver reads in a minute. Pure: the
 * engine's result, the capital plan (the proposal), the case file and the
 * pinned Monte Carlo run in, one `DecisionSummary` out; nothing on it needs
 * subtracting by hand.
 *
 * Figures (currency of the workspace, the case's valuation):
 * - capital by fiscal year: each chosen repower's capital in the fiscal year
 *   of its plan period (`fiscalLabelOfPeriod`), beside the budget of the
 *   period(s) that carry that label (null: no limit);
 * - gainVsRebuildAll = Σ_trucks npv(proposal's policy) − npv(rebuild)
 *   (`proposalGainVsRebuild`);
 * - bestMixGain = npv(best mix) − npv(rebuild every engine), repowerAllGain =
 *   npv(repower every truck) − npv(rebuild every engine): comparisons;
 *   gainVsBestMix = gainVsRebuildAll − bestMixGain (≤ 0 when a budget binds);
 * - irr, mirr, payback, discountedPayback: the engine's own comparison
 *   (`comparePolicies`, MODEL.md section 8) on the proposal's incremental cash
 *   flow ΔCF_y = Σ_trucks CF_y(policy) − CF_y(rebuild) (a truck with a
 *   shorter horizon adds 0 after its last period), discounted with the case's
 *   discount factors;
 * - fuel and CO2 saved a year: Σ_trucks (rebuild − proposal's policy) / the
 *   truck's horizon years (as the fleet summary does for the best mix);
 * - topDrivers: a tornado on the proposal's gain, policies held fixed
 *   (`proposalTopDrivers`); low/high are the gain at the driver's low and high
 *   value.
 *
 * Worked example (tests/unit/cases/decision-summary.test.ts): two trucks, A
 * repowered (ΔCF −100, +60, +60) and B kept (ΔCF 0, +5, +5 against rebuild)
 * at r = 10 %: ΔCF = (−100, 65, 65), gain = −100 + 65/1.1 + 65/1.21 = 12.81,
 * irr ≈ 19.43 %, payback 1 + 35/65 = 1.54 years.
 */
import { comparePolicies } from '@/lib/engine/results';
import { buildYearTables, resolveAssumptions } from '@/lib/engine/setup';
import { driverLabel, getDriver, listDrivers, makeEvaluator, tornado, DRIVER_CATALOGUE, type DriverRef, type Evaluator } from '@/lib/engine/sensitivity';
import type { CaseResult, PolicyResult } from '@/lib/engine/types';
import type { TimingSpec } from '@/lib/engine/timing';
import type { CaseFileInput } from '@/lib/validation/case';
import { fiscalLabelOfPeriod, type CapitalPlan } from '@/lib/plan';
import { chosenTrucks, proposalGainVsRebuild, proposalPolicyResult, type ProposalPolicies } from './proposal';

/** The pinned Monte Carlo run the summary quotes (its figures are the run's measure, in the case's currency). */
export interface DecisionRisk {
  /** the run's id (monte_carlo_runs.id) */
  runId: string;
  /** what the run measured, e.g. "ΔNPV of the proposal against rebuilding every engine" */
  label: string;
  sampleFailures: boolean;
  startedAt: string;
  iterations: number;
  seed: number;
  author: string;
  finishedAt: string;
  probabilityOfLoss: number;
  p10: number;
  p50: number;
  p90: number;
}

export interface DecisionDriver {
  label: string;
  /** the proposal's gain with the driver at its low value, currency */
  low: number;
  /** … at its high value */
  high: number;
  /** |high − low| */
  swing: number;
  /** driver id ("fuelPrice", "modulePrice@offer-1") */
  driver: string;
  unit: string;
  /** the driver's base, low and high values */
  base: number;
  driverLow: number;
  driverHigh: number;
}

export interface DecisionSummary {
  caseId: number;
  caseName: string;
  status: string;
  /** which figures these are: the frozen record, the submitted snapshot, or the live fleet data */
  source: 'frozen' | 'submitted' | 'live';
  valuation: 'expected' | 'median-path';
  currency: string;
  /** 1..12, workspace setting */
  fiscalYearStartMonth: number;
  /** the plan's month 0, "YYYY-MM" */
  planStartMonth: string;
  capitalByFiscalYear: { fiscalYear: string; capital: number; budget: number | null; trucks: string[] }[];
  totalCapital: number;
  /** expected NPV gain of the proposal vs rebuilding every engine */
  gainVsRebuildAll: number;
  /** proposal minus the unconstrained best mix (≤ 0 when a budget binds) */
  gainVsBestMix: number;
  bestMixGain: number;
  repowerAllGain: number;
  irr: number | null;
  mirr: number | null;
  payback: number | null;
  discountedPayback: number | null;
  fuelSavedLitresPerYear: number;
  co2SavedTonnesPerYear: number;
  risk: null | DecisionRisk;
  /** left out of the proposal by a budget: the gain each forgoes */
  leftOut: { truckId: string; capital: number; gainForgone: number; reason: string; extraBudget: number; fiscalYear: string }[];
  /** trucks whose repower does not pay against their better other policy (never proposed) */
  notWorthIt: string[];
  /** three largest swings of the proposal's gain */
  topDrivers: DecisionDriver[];
  chosenTrucks: string[];
  /** the policy of every truck in the proposal */
  policies: ProposalPolicies;
  /** each repowered truck's timing in the proposal (the fleet programme's option); absent in records made before it */
  timings?: Record<string, TimingSpec>;
  /** read from a frozen record: whether its hash still verifies (absent otherwise) */
  recordVerifies?: boolean;
}

export interface DecisionSummaryInput {
  caseId: number;
  caseName: string;
  status: string;
  source: DecisionSummary['source'];
  currency: string;
  fiscalYearStartMonth: number;
  planStartMonth: string;
  /** the evaluated case file (its assumptions give the discount factors) */
  file: CaseFileInput;
  result: CaseResult;
  /** the proposal's capital plan (the fleet programme's, `proposalFromProgramme`) */
  plan: CapitalPlan;
  /** the proposal's policy per truck (`Proposal.policies`) */
  policies: ProposalPolicies;
  /** each repowered truck's chosen timing (lib/cases/proposal.ts `Proposal.timings`); absent: the engine's repower */
  timings?: Record<string, PolicyResult>;
  /** the same trucks' timings as specs (kept in the summary: a risk analysis holds them fixed) */
  timingSpecs?: Record<string, TimingSpec>;
  /** `proposalTopDrivers(file, policies)`, or [] when not computed */
  drivers: DecisionDriver[];
  risk: DecisionRisk | null;
}

/** Σ_trucks CF_y(policy) − CF_y(rebuild), y = 0..longest horizon, and the capital categories the same way. */
export function proposalIncrementalFlows(result: CaseResult, policies: ProposalPolicies, timings: Record<string, PolicyResult> = {}): { delta: number[]; capital: number[] } {
  const n = result.trucks.reduce((m, t) => Math.max(m, t.options.rebuild.cashFlows.length - 1), 0);
  const delta = new Array<number>(n + 1).fill(0);
  const capital = new Array<number>(n + 1).fill(0);
  for (const t of result.trucks) {
    const p = policies[t.id] ?? 'rebuild';
    if (p === 'rebuild') continue;
    const a = proposalPolicyResult(t, policies, timings);
    const b = t.options.rebuild;
    for (let y = 0; y < a.cashFlows.length; y++) {
      delta[y] += a.cashFlows[y] - (b.cashFlows[y] ?? 0);
      capital[y] += (a.breakdown[y]?.capital ?? 0) - (b.breakdown[y]?.capital ?? 0);
    }
  }
  return { delta, capital };
}

export function buildDecisionSummary(input: DecisionSummaryInput): DecisionSummary {
  const { result, plan, file } = input;
  const policies = input.policies;
  const timings = input.timings ?? {};
  const chosen = chosenTrucks(plan);
  const gain = proposalGainVsRebuild(result, policies, timings);
  const bestMixGain = result.fleet.npv.best - result.fleet.npv.rebuild;
  const repowerAllGain = result.fleet.npv.repower - result.fleet.npv.rebuild;

  // the proposal's incremental cash flow against rebuilding every engine, through the engine's own comparison
  const a = resolveAssumptions(file.assumptions);
  const { delta, capital } = proposalIncrementalFlows(result, policies, timings);
  const tables = buildYearTables(a, Math.max(1, delta.length - 1));
  const zeros = new Array<number>(delta.length).fill(0);
  const cmp = comparePolicies(delta, zeros, tables.discountFactor, a.discountRate, capital);

  // capital by fiscal year (periods labelled by the fiscal year they start in; period 0 and 1 may share one)
  const fy = new Map<string, { capital: number; budget: number | null; unlimited: boolean; trucks: string[]; order: number }>();
  for (const y of plan.years) {
    const label = fiscalLabelOfPeriod(input.planStartMonth, y.year, input.fiscalYearStartMonth);
    const row = fy.get(label) ?? { capital: 0, budget: 0, unlimited: false, trucks: [], order: y.year };
    for (const c of y.chosen) {
      row.capital += c.capital;
      row.trucks.push(c.truckId);
    }
    if (y.budget === null) row.unlimited = true;
    else row.budget = (row.budget ?? 0) + y.budget;
    fy.set(label, row);
  }
  const capitalByFiscalYear = [...fy.entries()]
    .sort((x, y) => x[1].order - y[1].order)
    .filter(([, r]) => r.trucks.length > 0 || (!r.unlimited && (r.budget ?? 0) > 0))
    .map(([fiscalYear, r]) => ({ fiscalYear, capital: r.capital, budget: r.unlimited ? null : r.budget, trucks: r.trucks }));
  const totalCapital = capitalByFiscalYear.reduce((s, r) => s + r.capital, 0);

  let fuel = 0;
  let co2 = 0;
  for (const t of result.trucks) {
    const r = proposalPolicyResult(t, policies, timings);
    const years = Math.max(1, t.horizonYears);
    fuel += (t.options.rebuild.fuelLitres - r.fuelLitres) / years;
    co2 += (t.options.rebuild.co2Tonnes - r.co2Tonnes) / years;
  }

  const leftOut = plan.years.flatMap((y) => {
    const label = fiscalLabelOfPeriod(input.planStartMonth, y.year, input.fiscalYearStartMonth);
    return y.leftOut.map((l) => ({
      truckId: l.truckId,
      capital: l.capital,
      gainForgone: l.gain,
      reason: `over the ${label} budget`,
      /** what adding it to the chosen set would take on top of that budget */
      extraBudget: l.extraBudget,
      fiscalYear: label,
    }));
  });
  leftOut.sort((x, y) => y.gainForgone - x.gainForgone || x.truckId.localeCompare(y.truckId));

  return {
    caseId: input.caseId,
    caseName: input.caseName,
    status: input.status,
    source: input.source,
    valuation: a.valuation === 'median-path' ? 'median-path' : 'expected',
    currency: input.currency,
    fiscalYearStartMonth: input.fiscalYearStartMonth,
    planStartMonth: input.planStartMonth,
    capitalByFiscalYear,
    totalCapital,
    gainVsRebuildAll: gain,
    gainVsBestMix: gain - bestMixGain,
    bestMixGain,
    repowerAllGain,
    irr: cmp.irr,
    mirr: cmp.mirr,
    payback: cmp.paybackYears,
    discountedPayback: cmp.discountedPaybackYears,
    fuelSavedLitresPerYear: fuel,
    co2SavedTonnesPerYear: co2,
    risk: input.risk,
    leftOut,
    notWorthIt: plan.notWorthIt.map((c) => c.truckId),
    topDrivers: input.drivers.slice(0, 3),
    chosenTrucks: chosen,
    policies,
    timings: input.timingSpecs ?? {},
  };
}

/**
 * An evaluator of the proposal's gain: the engine's `proposal` metric (each
 * truck kept on its policy in the proposal while the drivers change), so the
 * summary's drivers and the risk pages measure the same thing.
 */
export function makeProposalEvaluator(validCase: CaseFileInput, policies: ProposalPolicies, timings: Record<string, TimingSpec> = {}): Evaluator {
  return makeEvaluator(validCase, { kind: 'proposal', policies, timings });
}

/**
 * The drivers that swing the proposal's gain most: a ±20 % tornado over the
 * fleet's drivers (`listDrivers`), largest swing first, `count` rows. A driver
 * whose base is 0 cannot move by ±20 % and is skipped. Kept on ±20 % (not the risk page's
 * realistic ranges) because the summary and the decision pack label it so.
 */
export function proposalTopDrivers(validCase: CaseFileInput, policies: ProposalPolicies, count = 3, currency = 'USD', timings: Record<string, TimingSpec> = {}): DecisionDriver[] {
  const drivers: DriverRef[] = listDrivers(validCase).filter((d) => getDriver(validCase, d) !== 0);
  if (drivers.length === 0) return [];
  const ev = makeProposalEvaluator(validCase, policies, timings);
  return tornado(ev, drivers, {}, 0.2)
    .slice(0, count)
    .map((r) => {
      const d = drivers.find((x) => (x.target ? `${x.key}@${x.target}` : x.key) === r.driver)!;
      return {
        label: driverLabel(d),
        low: r.metricLow,
        high: r.metricHigh,
        swing: r.swing,
        driver: r.driver,
        unit: DRIVER_CATALOGUE[d.key].unit.replace('USD', currency),
        base: r.base,
        driverLow: r.low,
        driverHigh: r.high,
      };
    });
}
