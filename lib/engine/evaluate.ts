/**
 * Evaluating a case: validate (unless trusted), set up each truck, run the
 * three policies, assemble cash flows, results, comparisons and the fleet.
 */
import {
  CaseValidationError,
  validateCase,
  type CaseFileInput,
  type Engine,
} from '@/lib/validation/case';
import { assembleCashFlows, buildPolicyDetail, type PolicyCash } from './cash-flow';
import { rollUpFleet } from './fleet';
import { bestPolicy, comparePolicies, policyResult } from './results';
import { buildCaseYearTables, buildTruckSetup, resolveAssumptions, resolveOffer, resolveTruck, type ResolvedOffer } from './setup';
import { createCaseNpvs, createNpvWorkspace, evaluateNpvsInto, type CaseNpvs } from './npv-only';
import { failureSourceOf, simulatePolicy } from './simulate';
import { expectedPolicyRun } from './expected';
import type {
  CaseResult,
  DetailedCaseResult,
  EvaluateOptions,
  PolicyKey,
  TruckDetail,
  TruckResult,
} from './types';

interface Evaluated {
  result: TruckResult;
  detail?: TruckDetail;
}

function checked(c: CaseFileInput, options: EvaluateOptions): CaseFileInput {
  if (options.trusted) return c;
  const v = validateCase(c);
  if (!v.ok) throw new CaseValidationError(v.problems);
  return v.value;
}

function evaluateTrucks(c: CaseFileInput, options: EvaluateOptions, detailed: boolean, only?: string): Evaluated[] {
  const a = resolveAssumptions(c.assumptions);
  const engines = new Map<string, Engine>(c.engines.map((e) => [e.id, e]));
  const offers = new Map<string, ResolvedOffer>(c.repowerOffers.map((o) => [o.id, resolveOffer(o)]));
  const out: Evaluated[] = [];
  const r = a.discountRate;
  const tables = buildCaseYearTables(a, c.trucks);
  for (let index = 0; index < c.trucks.length; index++) {
    const input = c.trucks[index];
    if (only !== undefined && input.id !== only) continue;
    const setup = buildTruckSetup(resolveTruck(input), a, engines, offers, tables);
    const df = setup.discountFactor;
    // the expectation over failures (MODEL.md section 11) unless the case asks for the median path
    // or the caller samples failure ages (Monte Carlo)
    const expected = a.valuation === 'expected' && !options.failureAge;
    const run = (policy: PolicyKey): PolicyCash =>
      assembleCashFlows(
        setup,
        expected ? expectedPolicyRun(setup, policy) : simulatePolicy(setup, policy, options.failureAge, detailed, index),
      );
    const keep = run('keep');
    const rebuild = run('rebuild');
    const repower = run('repower');
    const opts = {
      keep: policyResult(keep, df, r, a.taxRate),
      rebuild: policyResult(rebuild, df, r, a.taxRate),
      repower: policyResult(repower, df, r, a.taxRate),
    };
    const capital = (p: PolicyKey) => opts[p].breakdown.map((b) => b.capital);
    const repowerCapital = capital('repower');
    const result: TruckResult = {
      id: input.id,
      horizonYears: setup.n,
      options: opts,
      repowerVsRebuild: comparePolicies(opts.repower.cashFlows, opts.rebuild.cashFlows, df, r, repowerCapital),
      repowerVsKeep: comparePolicies(opts.repower.cashFlows, opts.keep.cashFlows, df, r, repowerCapital),
      rebuildVsKeep: comparePolicies(opts.rebuild.cashFlows, opts.keep.cashFlows, df, r, capital('rebuild')),
      best: bestPolicy({ keep: opts.keep.npv, rebuild: opts.rebuild.npv, repower: opts.repower.npv }),
    };
    if (!detailed) {
      out.push({ result });
      continue;
    }
    const detail: TruckDetail = {
      truckId: input.id,
      horizonYears: setup.n,
      startEngineId: setup.start.id,
      repowerEngineId: setup.next.id,
      repowerOfferId: setup.offer.id,
      powerKw: setup.powerKw,
      calibrationFactor: setup.calibration,
      burnLitresPerHour: { [setup.start.id]: setup.burnStart, [setup.next.id]: setup.burnNext },
      policies: {
        keep: buildPolicyDetail(setup, keep),
        rebuild: buildPolicyDetail(setup, rebuild),
        repower: buildPolicyDetail(setup, repower),
      },
    };
    out.push({ result, detail });
  }
  return out;
}

/**
 * Evaluate a `case/1` into `case-result/1` (MODEL.md section 10).
 * The case is validated first and a `CaseValidationError` (with every
 * problem) is thrown if it does not pass; nothing is simulated then.
 * `options.trusted` skips validation for a case already validated (e.g.
 * many evaluations of modified clones); `options.failureAge` replaces the
 * median failure path (Monte Carlo).
 *
 * @example evaluateCase(oneTruck).trucks[0].horizonYears // = 3 for scenarios/one-truck.json (18,000 h at 6,000 h a year)
 */
export function evaluateCase(c: CaseFileInput, options: EvaluateOptions = {}): CaseResult {
  const valid = checked(c, options);
  const trucks = evaluateTrucks(valid, options, false).map((e) => e.result);
  return { format: 'case-result/1', name: valid.name, trucks, fleet: rollUpFleet(trucks) };
}

/**
 * `evaluateCase` plus, per truck and policy, every period's physical
 * quantities, prices, events, segments, depreciation and residual: enough to
 * rebuild each money figure from quantities and assumptions (workbook export)
 * or to draw an event timeline.
 */
export function evaluateCaseDetailed(c: CaseFileInput, options: EvaluateOptions = {}): DetailedCaseResult {
  const valid = checked(c, options);
  const evaluated = evaluateTrucks(valid, options, true);
  const trucks = evaluated.map((e) => e.result);
  return {
    result: { format: 'case-result/1', name: valid.name, trucks, fleet: rollUpFleet(trucks) },
    details: evaluated.map((e) => e.detail as TruckDetail),
  };
}

/**
 * One truck of a case, with its detail (for sensitivity runs on a single truck).
 * Throws if the truck id is not in the case.
 */
export function evaluateTruck(
  c: CaseFileInput,
  truckId: string,
  options: EvaluateOptions = {},
): { result: TruckResult; detail: TruckDetail } {
  const valid = checked(c, options);
  const [found] = evaluateTrucks(valid, options, true, truckId);
  if (!found || !found.detail) throw new Error(`no truck with id "${truckId}"`);
  return { result: found.result, detail: found.detail };
}

/**
 * Npvs of every truck and policy; equal, number for number, to
 * `evaluateCase(c).trucks[i].options[p].npv` (a test proves it).
 */
export function evaluateNpvs(c: CaseFileInput, options: EvaluateOptions = {}): CaseNpvs {
  const valid = checked(c, options);
  const out = createCaseNpvs(valid.trucks.length);
  evaluateNpvsInto(valid, options.failureAge ? failureSourceOf(options.failureAge) : null, out, createNpvWorkspace());
  return out;
}
