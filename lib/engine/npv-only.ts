/**
 * The lean evaluation path for sensitivity and Monte Carlo: the same set-up,
 * simulation and cash flows as `evaluateCase` (shared code, not a second
 * model), but only each policy's npv per truck, without the trace, IRR, MIRR,
 * paybacks or breakdown arrays that many re-evaluations do not read.
 * `evaluateNpvs`, which validates first, is in evaluate.ts: this module stays
 * free of the validation schemas, so the Monte Carlo worker bundle is small.
 */
import type { CaseFileInput, Engine } from '@/lib/validation/case';
import { bestPolicy } from './results';
import { buildCaseYearTables, buildTruckSetup, resolveAssumptions, resolveOffer, resolveTruck, type ResolvedOffer, type TruckSetup } from './setup';
import { expectedPolicyRun } from './expected';
import { emptyPolicyRun, simulatePolicyInto, type FailureAgeSource, type PolicyRun } from './simulate';
import type { PolicyKey } from './types';

/** Npv of each policy per truck, in the case's truck order. */
export interface CaseNpvs {
  truckIds: string[];
  keep: Float64Array;
  rebuild: Float64Array;
  repower: Float64Array;
  best: PolicyKey[];
}

/** Buffers reused from one evaluation to the next (Monte Carlo keeps one per worker). */
export interface NpvWorkspace {
  run: PolicyRun;
  /** the last setup of each truck (by index), to lend its hours to the next */
  setups: (TruckSetup | undefined)[];
}

export function createNpvWorkspace(): NpvWorkspace {
  return { run: emptyPolicyRun(), setups: [] };
}

export function createCaseNpvs(count: number): CaseNpvs {
  return {
    truckIds: new Array<string>(count),
    keep: new Float64Array(count),
    rebuild: new Float64Array(count),
    repower: new Float64Array(count),
    best: new Array<PolicyKey>(count),
  };
}

/**
 * `evaluateNpvs` of a valid case into `out` (sized for its trucks), reusing
 * the workspace's buffers: what Monte Carlo calls once per iteration.
 */
export function evaluateNpvsInto(
  valid: CaseFileInput,
  failures: FailureAgeSource | null,
  out: CaseNpvs,
  ws: NpvWorkspace,
): void {
  const a = resolveAssumptions(valid.assumptions);
  const engines = new Map<string, Engine>(valid.engines.map((e) => [e.id, e]));
  const offers = new Map<string, ResolvedOffer>(valid.repowerOffers.map((o) => [o.id, resolveOffer(o)]));
  const tables = buildCaseYearTables(a, valid.trucks);
  const { run } = ws;
  const count = valid.trucks.length;
  // the expectation over failures (MODEL.md section 11) unless failures are sampled or the case asks for the median path
  const expected = failures === null && a.valuation === 'expected';
  for (let i = 0; i < count; i++) {
    const input = valid.trucks[i];
    const setup = buildTruckSetup(resolveTruck(input), a, engines, offers, tables, ws.setups[i]);
    ws.setups[i] = setup;
    let keep: number, rebuild: number, repower: number;
    if (expected) {
      keep = expectedPolicyRun(setup, 'keep', run).npv;
      rebuild = expectedPolicyRun(setup, 'rebuild', run).npv;
      repower = expectedPolicyRun(setup, 'repower', run).npv;
    } else {
      keep = simulatePolicyInto(run, setup, 'keep', failures, false, i, false).npv;
      rebuild = simulatePolicyInto(run, setup, 'rebuild', failures, false, i, false).npv;
      repower = simulatePolicyInto(run, setup, 'repower', failures, false, i, false).npv;
    }
    out.truckIds[i] = input.id;
    out.keep[i] = keep;
    out.rebuild[i] = rebuild;
    out.repower[i] = repower;
    out.best[i] = bestPolicy({ keep, rebuild, repower });
  }
}

/** The fleet's best-mix npv: each truck's best policy, summed in truck order as `rollUpFleet` does. */
export function fleetBestNpv(n: CaseNpvs): number {
  let sum = 0;
  for (let i = 0; i < n.truckIds.length; i++) sum += n[n.best[i]][i];
  return sum;
}
