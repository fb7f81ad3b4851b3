/**
 * The capital plan: in each year (the period of each repower's spend) choose
 * the repowers that maximise the total gain within that year's budget, as an
 * exact 0/1 knapsack (./knapsack.ts), then say what was left out and the
 * extra budget that would let each be added to the chosen set.
 *
 * A year with no budget given is not limited: every repower with a positive
 * gain is chosen. A repower with no positive gain is never chosen (it loses
 * money against the truck's better other policy) and is listed apart.
 */
import { solveKnapsack } from './knapsack';

export interface PlanCandidate {
  truckId: string;
  /** npv(repower) − npv(best other policy) */
  gain: number;
  profitabilityIndex: number | null;
  /** capital spend, positive */
  capital: number;
  /** period of the spend */
  capitalYear: number;
}

export interface LeftOut {
  truckId: string;
  gain: number;
  capital: number;
  /** max(0, capital − budget left unspent): what adding it to the chosen set would take */
  extraBudget: number;
}

export interface YearPlan {
  year: number;
  /** null: no limit set */
  budget: number | null;
  chosen: PlanCandidate[];
  leftOut: LeftOut[];
  spent: number;
  gain: number;
  /** money unit the knapsack counted in (costs rounded up, budget down) */
  unit: number;
}

export interface CapitalPlan {
  years: YearPlan[];
  /** repowers that do not pay against the better other policy */
  notWorthIt: PlanCandidate[];
  totalGain: number;
  totalSpent: number;
}

export function planCapital(candidates: PlanCandidate[], budgets: Record<number, number | null | undefined>, unit = 1000): CapitalPlan {
  const worth = candidates.filter((c) => c.gain > 1e-6 && c.capital > 0);
  const notWorthIt = candidates.filter((c) => !worth.includes(c));
  const years = [...new Set(worth.map((c) => c.capitalYear))].sort((a, b) => a - b);
  const plans: YearPlan[] = years.map((year) => {
    const items = worth.filter((c) => c.capitalYear === year);
    const b = budgets[year];
    const budget = b === undefined || b === null || !Number.isFinite(b) ? null : Math.max(0, b);
    const answer = solveKnapsack(
      items.map((c) => ({ id: c.truckId, cost: c.capital, gain: c.gain })),
      budget ?? Infinity,
      unit,
    );
    const chosenIds = new Set(answer.chosen);
    const chosen = items.filter((c) => chosenIds.has(c.truckId)).sort((a, c) => c.gain - a.gain);
    const slack = budget === null ? Infinity : budget - answer.totalCost;
    const leftOut = items
      .filter((c) => !chosenIds.has(c.truckId))
      .map((c) => ({ truckId: c.truckId, gain: c.gain, capital: c.capital, extraBudget: Math.max(0, c.capital - slack) }))
      .sort((a, c) => c.gain - a.gain);
    return { year, budget, chosen, leftOut, spent: answer.totalCost, gain: answer.totalGain, unit: answer.unit };
  });
  return {
    years: plans,
    notWorthIt,
    totalGain: plans.reduce((s, p) => s + p.gain, 0),
    totalSpent: plans.reduce((s, p) => s + p.spent, 0),
  };
}
