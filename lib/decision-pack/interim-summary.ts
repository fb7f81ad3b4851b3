/**
 * A decision summary built from the case's evaluated result and its saved plan,
 * used until `lib/cases/decision-summary.ts` (`buildDecisionSummary`) is
 * merged. Pure. Risk (a pinned Monte Carlo run) and the driver swings are not
 * known here: `risk` is null ("no pinned run") and `topDrivers` empty.
 */
import type { CaseResultDto } from '@/lib/cases/types';
import { chosenTrucks, proposalGainVsRebuild, proposalPolicies, type ProposalPolicies } from '@/lib/cases/proposal';
import { comparePolicies } from '@/lib/engine';
import { fiscalYearLabel, fiscalYearOfPeriod, moneyK } from './layout';
import type { DecisionSummary } from './summary-types';

/** Σ over trucks, by period, of the proposal's cash flow minus rebuilding's. */
export function incrementalFlows(dto: CaseResultDto, policies: ProposalPolicies): { delta: number[]; capital: number[] } {
  const delta: number[] = [];
  const capital: number[] = [];
  for (const t of dto.result.trucks) {
    const p = t.options[policies[t.id] ?? 'rebuild'];
    const r = t.options.rebuild;
    p.cashFlows.forEach((cf, y) => {
      delta[y] = (delta[y] ?? 0) + cf - (r.cashFlows[y] ?? 0);
      capital[y] = (capital[y] ?? 0) + (p.breakdown[y]?.capital ?? 0);
    });
  }
  return { delta: Array.from(delta, (x) => x ?? 0), capital: Array.from(capital, (x) => x ?? 0) };
}

export function interimDecisionSummary(dto: CaseResultDto, o: { discountRate: number; fiscalYearStartMonth: number }): DecisionSummary {
  const { result, plan } = dto;
  const policies = proposalPolicies(result, plan);
  const chosen = chosenTrucks(plan);
  const gain = proposalGainVsRebuild(result, policies);
  const bestMixGain = result.fleet.npv.best - result.fleet.npv.rebuild;
  const fy = (period: number) => fiscalYearOfPeriod(dto.case.plan.startMonth, period, o.fiscalYearStartMonth);
  const byFy = new Map<number, { fiscalYear: number; capital: number; budget: number | null; trucks: string[] }>();
  for (const y of plan.years) {
    const f = fy(y.year);
    const e = byFy.get(f) ?? { fiscalYear: f, capital: 0, budget: null, trucks: [] };
    e.capital += y.chosen.reduce((s, c) => s + c.capital, 0);
    if (y.budget !== null) e.budget = (e.budget ?? 0) + y.budget;
    e.trucks.push(...y.chosen.map((c) => c.truckId));
    byFy.set(f, e);
  }
  const { delta, capital } = incrementalFlows(dto, policies);
  const df = delta.map((_, y) => (1 + o.discountRate) ** -y);
  const cmp = delta.length && chosen.length ? comparePolicies(delta, delta.map(() => 0), df, o.discountRate, capital) : null;
  let fuel = 0;
  let co2 = 0;
  for (const t of result.trucks) {
    const p = t.options[policies[t.id] ?? 'rebuild'];
    const n = Math.max(1, t.horizonYears);
    fuel += (t.options.rebuild.fuelLitres - p.fuelLitres) / n;
    co2 += (t.options.rebuild.co2Tonnes - p.co2Tonnes) / n;
  }
  return {
    caseId: dto.case.id,
    caseName: dto.case.name,
    status: dto.case.status,
    source: dto.case.status === 'approved' ? 'frozen' : dto.case.status === 'submitted' ? 'submitted' : 'live',
    valuation: dto.valuation,
    currency: dto.currency,
    fiscalYearStartMonth: o.fiscalYearStartMonth,
    capitalByFiscalYear: [...byFy.values()].sort((a, b) => a.fiscalYear - b.fiscalYear),
    totalCapital: plan.totalSpent,
    gainVsRebuildAll: gain,
    gainVsBestMix: gain - bestMixGain,
    bestMixGain,
    repowerAllGain: result.fleet.npv.repower - result.fleet.npv.rebuild,
    irr: cmp?.irr ?? null,
    mirr: cmp?.mirr ?? null,
    payback: cmp?.paybackYears ?? null,
    discountedPayback: cmp?.discountedPaybackYears ?? null,
    fuelSavedLitresPerYear: fuel,
    co2SavedTonnesPerYear: co2,
    risk: null,
    leftOut: plan.years.flatMap((y) =>
      y.leftOut.map((l) => ({
        truckId: l.truckId,
        capital: l.capital,
        gainForgone: l.gain,
        reason: `over the ${fiscalYearLabel(fy(y.year))} budget: needs ${moneyK(l.extraBudget, dto.negativeStyle)} k more`,
      })),
    ),
    topDrivers: [],
    chosenTrucks: chosen,
  };
}
