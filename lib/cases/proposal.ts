/**
 * The proposal: a case's answer, the fleet programme's (lib/cases/programme.ts):
 * each truck takes the timing the programme chose under the saved budgets
 * and shop capacity — repowered now or at its k-th planned event (possibly
 * late), or kept, or rebuilt. Pure: the engine's result and the programme in,
 * one policy per truck (with its timing when repowered) out.
 *
 * The proposal's gain is measured against rebuilding every engine:
 *   gain = Σ_trucks npv(policy of the truck in the proposal, at its timing) − npv(rebuild).
 * The same policies and timings are held fixed when a tornado or break-even
 * varies the inputs (the engine's `proposal` metric), so the risk pages test
 * what is proposed. A Monte Carlo run simulates a repowered truck at its
 * offer's own repower (its sampled failure paths do not follow a later or
 * delayed timing).
 */
import type { CaseResult, PolicyKey, PolicyResult } from '@/lib/engine/types';
import type { CaseProgramme } from '@/lib/plan/programme-case';
import type { TimingSpec } from '@/lib/engine/timing';
import { bestOtherPolicy, monthLabel, rankTrucks, type CapitalPlan, type PlacedSwap, type RankedTruck } from '@/lib/plan';

export type ProposalPolicies = Record<string, PolicyKey>;

/** Trucks the plan chooses for repower, in the plan's order (by year, then gain). */
export function chosenTrucks(plan: CapitalPlan): string[] {
  return plan.years.flatMap((y) => y.chosen.map((c) => c.truckId));
}

/** Σ over trucks of npv(proposal's policy, with its chosen timing when repowered) − npv(rebuild), currency. */
export function proposalGainVsRebuild(result: CaseResult, policies: ProposalPolicies, timings: Record<string, PolicyResult> = {}): number {
  let sum = 0;
  for (const t of result.trucks) sum += proposalPolicyResult(t, policies, timings).npv - t.options.rebuild.npv;
  return sum;
}

export interface PlanSettingsLike {
  budgets: Record<string, number | null>;
  swapsPerMonth: number;
  startMonth: string;
}

export type ProposalSwap = PlacedSwap & { label: string; dueLabel: string; capitalYear: number | null };

/** The proposal as a case's saved plan settings make it: the ranking, the capital plan within the budgets, the swap schedule and each truck's policy. */
export interface Proposal {
  ranking: RankedTruck[];
  plan: CapitalPlan;
  schedule: ProposalSwap[];
  policies: ProposalPolicies;
  chosen: string[];
  /**
   * the expected result of each repowered truck's chosen timing (the fleet
   * programme's option: now, at the k-th planned event, possibly d months
   * late), which stands for the truck's `repower` in the proposal's figures
   */
  timings: Record<string, PolicyResult>;
  /** the same trucks' timings as specs (kind, k, delay): what a risk analysis holds fixed */
  timingSpecs: Record<string, TimingSpec>;
}

/**
 * The case result with each timed truck's `repower` replaced by its chosen
 * timing's result (for readers of one policy per truck, e.g. plan against
 * actual on a frozen record). The fleet totals are left as they were.
 */
export function resultAtProposalTimings(result: CaseResult, timings: Record<string, PolicyResult> = {}): CaseResult {
  if (Object.keys(timings).length === 0) return result;
  return { ...result, trucks: result.trucks.map((t) => (timings[t.id] ? { ...t, options: { ...t.options, repower: timings[t.id] } } : t)) };
}

/** A truck's result under its policy in the proposal: its chosen timing when repowered, else the engine's policy. */
export function proposalPolicyResult(truck: CaseResult['trucks'][number], policies: ProposalPolicies, timings: Record<string, PolicyResult> = {}): PolicyResult {
  const p = policies[truck.id] ?? 'rebuild';
  return p === 'repower' && timings[truck.id] ? timings[truck.id] : truck.options[p];
}

/**
 * The proposal as the fleet programme answers it (lib/cases/programme.ts,
 * issue 15): a truck whose chosen option swaps its engine (now, or at the
 * k-th planned event, possibly late) is repowered with that timing's
 * expected result; keep and rebuild stay the engine's own policies. The
 * capital plan lists each swap in the period whose budget carries it; the
 * schedule places it in its planned month (its due month + the delay the
 * shop or a budget forced). A truck whose best option swaps but whose
 * chosen one does not is left out of its period's budget.
 */
export function proposalFromProgramme(result: CaseResult, programme: CaseProgramme, settings: PlanSettingsLike): Proposal {
  const ranking = rankTrucks(result);
  const policies: ProposalPolicies = {};
  const timings: Record<string, PolicyResult> = {};
  const timingSpecs: Record<string, TimingSpec> = {};
  const years = new Map<number, { chosen: PlanCandidateLike[]; leftOut: CapitalPlan['years'][number]['leftOut'] }>();
  const notWorthIt: PlanCandidateLike[] = [];
  const schedule: ProposalSwap[] = [];
  const yearOf = (y: number) => {
    let v = years.get(y);
    if (!v) years.set(y, (v = { chosen: [], leftOut: [] }));
    return v;
  };
  const byId = new Map(result.trucks.map((t) => [t.id, t]));
  const choices = programme.result.ok ? programme.result.choices : [];
  programme.options.forEach((entry, i) => {
    const truck = byId.get(entry.truckId);
    if (!truck) return;
    const choice = choices[i];
    const chosen = choice ? entry.options.find((o) => o.key === choice.option.key) : undefined;
    const best = choice ? entry.options.find((o) => o.key === choice.best.key) : undefined;
    const other = bestOtherPolicy(truck);
    const otherNpv = truck.options[other].npv;
    const swaps = (o: typeof chosen) => !!o && o.swapPeriod !== null && o.kind !== 'keep' && o.kind !== 'rebuild';
    if (chosen && swaps(chosen)) {
      policies[truck.id] = 'repower';
      timings[truck.id] = chosen.result;
      timingSpecs[truck.id] = { kind: chosen.kind, k: chosen.k, delayMonths: chosen.delayMonths };
      const period = chosen.swapPeriod as number;
      const capital = chosen.plannedCapital[period] ?? 0;
      const gain = chosen.npv - otherNpv;
      yearOf(period).chosen.push({ truckId: truck.id, gain, profitabilityIndex: capital > 0 ? gain / capital : null, capital, capitalYear: period });
      const month = chosen.swapMonth as number;
      schedule.push({
        truckId: truck.id,
        dueMonth: month - chosen.delayMonths,
        month,
        movedEarlier: false,
        late: chosen.delayMonths > 0,
        label: monthLabel(settings.startMonth, month),
        dueLabel: monthLabel(settings.startMonth, month - chosen.delayMonths),
        capitalYear: period,
      });
      return;
    }
    policies[truck.id] = chosen?.kind === 'keep' ? 'keep' : chosen?.kind === 'rebuild' ? 'rebuild' : other;
    if (best && swaps(best)) {
      const period = best.swapPeriod as number;
      const capital = best.plannedCapital[period] ?? 0;
      yearOf(period).leftOut.push({ truckId: truck.id, gain: best.npv - otherNpv, capital, extraBudget: Math.max(0, capital - budgetLeft(programme, settings, period)) });
    } else {
      const r = ranking.find((x) => x.truckId === truck.id);
      if (r && r.capitalYear !== null) notWorthIt.push({ truckId: truck.id, gain: r.gain, profitabilityIndex: r.profitabilityIndex, capital: r.capital, capitalYear: r.capitalYear });
    }
  });
  const plan: CapitalPlan = {
    years: [...years.entries()]
      .sort((a, b) => a[0] - b[0])
      .map(([year, y]) => {
        const b = settings.budgets[String(year)];
        const chosen = y.chosen.sort((a, c) => c.gain - a.gain);
        return {
          year,
          budget: b === undefined || b === null ? null : b,
          chosen,
          leftOut: y.leftOut.sort((a, c) => c.gain - a.gain),
          spent: chosen.reduce((s, c) => s + c.capital, 0),
          gain: chosen.reduce((s, c) => s + c.gain, 0),
        };
      }),
    notWorthIt,
    totalGain: 0,
    totalSpent: 0,
  };
  plan.totalGain = plan.years.reduce((s, y) => s + y.gain, 0);
  plan.totalSpent = plan.years.reduce((s, y) => s + y.spent, 0);
  schedule.sort((a, b) => a.month - b.month || a.truckId.localeCompare(b.truckId));
  return { ranking, plan, schedule, policies, chosen: chosenTrucks(plan), timings, timingSpecs };
}

type PlanCandidateLike = CapitalPlan['years'][number]['chosen'][number];

/** Budget of a period less the programme's planned capital in it (∞ without a budget). */
function budgetLeft(programme: CaseProgramme, settings: PlanSettingsLike, period: number): number {
  const b = settings.budgets[String(period)];
  if (b === undefined || b === null) return Number.POSITIVE_INFINITY;
  return b - (programme.byFiscalYear[period]?.plannedCapital ?? 0);
}
