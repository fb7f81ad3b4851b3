/**
 * The lean evaluation path for sensitivity and Monte Carlo: the same set-up,
 * simulation and cash flows as `evaluateCase` (shared code, not a second
 * model), but only each policy's npv per truck, without the trace, IRR, MIRR,
 * paybacks or breakdown arrays that many re-evaluations do not read.
 */
import type { CaseFileInput, Engine, RepowerOffer } from '@/lib/validation/case';
import { CaseValidationError, validateCase } from '@/lib/validation/case';
import { policyNpv } from './cash-flow';
import { bestPolicy } from './results';
import { buildTruckSetup, resolveAssumptions, resolveOffer, resolveTruck } from './setup';
import { simulatePolicy } from './simulate';
import type { EvaluateOptions, PolicyKey } from './types';

/** Npv of each policy per truck, in the case's truck order. */
export interface CaseNpvs {
  truckIds: string[];
  keep: Float64Array;
  rebuild: Float64Array;
  repower: Float64Array;
  best: PolicyKey[];
}

/**
 * Npvs of every truck and policy; equal, number for number, to
 * `evaluateCase(c).trucks[i].options[p].npv` (a test proves it).
 */
export function evaluateNpvs(c: CaseFileInput, options: EvaluateOptions = {}): CaseNpvs {
  let valid = c;
  if (!options.trusted) {
    const v = validateCase(c);
    if (!v.ok) throw new CaseValidationError(v.problems);
    valid = v.value;
  }
  const a = resolveAssumptions(valid.assumptions);
  const engines = new Map<string, Engine>(valid.engines.map((e) => [e.id, e]));
  const offers = new Map<string, RepowerOffer>(valid.repowerOffers.map((o) => [o.id, resolveOffer(o)]));
  const count = valid.trucks.length;
  const out: CaseNpvs = {
    truckIds: new Array<string>(count),
    keep: new Float64Array(count),
    rebuild: new Float64Array(count),
    repower: new Float64Array(count),
    best: new Array<PolicyKey>(count),
  };
  for (let i = 0; i < count; i++) {
    const input = valid.trucks[i];
    const setup = buildTruckSetup(resolveTruck(input), a, engines, offers);
    const keep = policyNpv(setup, simulatePolicy(setup, 'keep', options.failureAge));
    const rebuild = policyNpv(setup, simulatePolicy(setup, 'rebuild', options.failureAge));
    const repower = policyNpv(setup, simulatePolicy(setup, 'repower', options.failureAge));
    out.truckIds[i] = input.id;
    out.keep[i] = keep;
    out.rebuild[i] = rebuild;
    out.repower[i] = repower;
    out.best[i] = bestPolicy({ keep, rebuild, repower });
  }
  return out;
}

/** The fleet's best-mix npv: each truck's best policy, summed in truck order as `rollUpFleet` does. */
export function fleetBestNpv(n: CaseNpvs): number {
  let sum = 0;
  for (let i = 0; i < n.truckIds.length; i++) sum += n[n.best[i]][i];
  return sum;
}
