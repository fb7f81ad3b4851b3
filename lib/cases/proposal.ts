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
import type { CaseFile } from '@/lib/engine';
import { repowerDue } from './swap-due';
import type { CaseResult, PolicyKey, TruckDetail } from '@/lib/engine/types';
import { bestOtherPolicy, monthLabel, monthOfEvent, planCapital, rankTrucks, scheduleSwaps, type CapitalPlan, type PlacedSwap, type RankedTruck } from '@/lib/plan';

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

/**
 * What the plan and schedule need of a truck: when its repower is due (the
 * period its capital is planned in and the month of the swap:
 * lib/cases/swap-due.ts), and its annual hours. Null when no repower is due.
 */
export interface ProposalTruckTiming {
  repowerMonth: number | null;
  /** period the repower's capital is planned in (null: the ranking's first period of spend) */
  duePeriod: number | null;
  annualHours: number;
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
}

/**
 * The proposal of a case from the engine's result and its saved plan settings:
 * rank the trucks, choose the repowers within each year's budget, place each
 * chosen swap in the month its repower is due (at most `swapsPerMonth` a
 * month). Pure; the server's evaluation and the freeze both call it, so what
 * is shown and what is approved are one computation.
 */
export function buildProposal(result: CaseResult, timing: Record<string, ProposalTruckTiming>, settings: PlanSettingsLike): Proposal {
  // the capital of a repower is planned in the period its swap is due
  const ranking = rankTrucks(result).map((r) => {
    const due = r.capitalYear === null ? null : timing[r.truckId]?.duePeriod;
    return due === null || due === undefined ? r : { ...r, capitalYear: due };
  });
  const candidates = ranking
    .filter((r) => r.capitalYear !== null)
    .map((r) => ({ truckId: r.truckId, gain: r.gain, profitabilityIndex: r.profitabilityIndex, capital: r.capital, capitalYear: r.capitalYear as number }));
  const budgets = Object.fromEntries(Object.entries(settings.budgets).map(([y, b]) => [Number(y), b]));
  const plan = planCapital(candidates, budgets);
  // each chosen swap is placed from the month its repower is due
  const requests = plan.years.flatMap((y) =>
    y.chosen.map((c) => {
      const t = timing[c.truckId];
      return { truckId: c.truckId, gain: c.gain, dueMonth: t?.repowerMonth ?? monthOfEvent(c.capitalYear, 0, t?.annualHours ?? 0) };
    }),
  );
  const yearOf = new Map(candidates.map((c) => [c.truckId, c.capitalYear]));
  const schedule = scheduleSwaps(requests, settings.swapsPerMonth).map((s) => ({
    ...s,
    label: monthLabel(settings.startMonth, s.month),
    dueLabel: monthLabel(settings.startMonth, s.dueMonth),
    capitalYear: yearOf.get(s.truckId) ?? null,
  }));
  return { ranking, plan, schedule, policies: proposalPolicies(result, plan), chosen: chosenTrucks(plan) };
}

/**
 * Every truck's repower timing (lib/cases/swap-due.ts): on the median path the
 * repower event of the engine's trace, under the expected valuation the month
 * the current engine reaches its planned life with no failure before it (or
 * now). The server's evaluation, the freeze and the mails all call it.
 */
export function timingFromDetails(file: CaseFile, result: CaseResult, details: readonly TruckDetail[]): Record<string, ProposalTruckTiming> {
  const out: Record<string, ProposalTruckTiming> = {};
  const firstSpend = new Map(rankTrucks(result).map((r) => [r.truckId, r.capitalYear]));
  for (const d of details) {
    const input = file.trucks.find((t) => t.id === d.truckId);
    const truck = result.trucks.find((t) => t.id === d.truckId);
    if (!input || !truck) continue;
    const annualHours = input.annualHours;
    const ev = d.policies.repower.events.find((e) => e.kind === 'repower');
    const traced = ev ? { period: ev.period, month: monthOfEvent(ev.period, ev.hourOfYear, annualHours) } : undefined;
    const fallbackPeriod = firstSpend.get(d.truckId) ?? null;
    const due =
      fallbackPeriod === null
        ? null
        : repowerDue({
            valuation: file.assumptions.valuation,
            engineHours: input.engineHours,
            annualHours,
            remainingLifeHours: input.remainingLifeHours,
            lifeHours: file.engines.find((e) => e.id === input.engineId)!.lifeHours,
            timing: file.repowerOffers.find((o) => o.id === input.repowerOfferId)!.timing,
            horizonYears: truck.horizonYears,
            traced,
            fallbackPeriod,
          });
    out[d.truckId] = { repowerMonth: due?.month ?? null, duePeriod: due?.period ?? null, annualHours };
  }
  return out;
}
