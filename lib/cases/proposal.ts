/**
 * The proposal: a case's answer. The trucks its saved plan chooses are
 * repowered; every other truck follows the better of keep and rebuild (what a
 * planner who does not repower it would do; ties go to rebuild, as in the
 * ranking). Pure: the engine's result and the capital plan in, one policy per
 * truck out.
 *
 * The proposal's gain is measured against rebuilding every engine:
 *   gain = Σ_trucks npv(policy of the truck in the proposal) − npv(rebuild).
 * The same policy map is held fixed when a risk analysis varies the inputs
 * (the engine's `proposal` metric), so the risk pages test what is proposed.
 */
import type { CaseResult, PolicyKey } from '@/lib/engine/types';
import { bestOtherPolicy, type CapitalPlan } from '@/lib/plan';

export type ProposalPolicies = Record<string, PolicyKey>;

/** Trucks the plan chooses for repower, in the plan's order (by year, then gain). */
export function chosenTrucks(plan: CapitalPlan): string[] {
  return plan.years.flatMap((y) => y.chosen.map((c) => c.truckId));
}

export function proposalPolicies(result: CaseResult, plan: CapitalPlan): ProposalPolicies {
  const chosen = new Set(chosenTrucks(plan));
  return Object.fromEntries(result.trucks.map((t) => [t.id, chosen.has(t.id) ? 'repower' : bestOtherPolicy(t)]));
}

/** Σ over trucks of npv(proposal's policy) − npv(rebuild), currency. */
export function proposalGainVsRebuild(result: CaseResult, policies: ProposalPolicies): number {
  let sum = 0;
  for (const t of result.trucks) sum += t.options[policies[t.id] ?? 'rebuild'].npv - t.options.rebuild.npv;
  return sum;
}
