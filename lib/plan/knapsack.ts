/**
 * Exact 0/1 knapsack by dynamic programming over money in whole `unit`s.
 *
 * Each item's cost is rounded UP to a whole number of units and the budget
 * DOWN, so a chosen set never exceeds the true budget; within that
 * resolution the answer is exact (the maximum total gain over every subset),
 * which the unit tests check against enumerating every subset. Memory is
 * n × (W + 1) bytes for the choice table (W = budget in units).
 */
export interface KnapsackItem {
  id: string;
  /** positive amount of money */
  cost: number;
  /** what choosing it adds; only positive gains are worth choosing */
  gain: number;
}

export interface KnapsackAnswer {
  chosen: string[];
  totalGain: number;
  totalCost: number;
  /** the money unit the costs were counted in */
  unit: number;
}

/** Largest choice table we build (cells); above it the unit is coarsened tenfold until it fits. */
export const MAX_CELLS = 40_000_000;

export const unitsOf = (cost: number, unit: number) => Math.max(0, Math.ceil(cost / unit - 1e-9));

export function solveKnapsack(items: KnapsackItem[], budget: number, unit = 1000): KnapsackAnswer {
  const useful = items.filter((i) => i.gain > 0);
  const sumCost = useful.reduce((s, i) => s + i.cost, 0);
  if (sumCost <= budget) {
    // everything fits: no search needed (and no rounding either)
    return { chosen: useful.map((i) => i.id), totalGain: useful.reduce((s, i) => s + i.gain, 0), totalCost: sumCost, unit };
  }
  let u = unit;
  while (useful.length * (Math.floor(budget / u) + 1) > MAX_CELLS) u *= 10;
  const W = Math.max(0, Math.floor(budget / u + 1e-9));
  const w = useful.map((i) => unitsOf(i.cost, u));
  const best = new Float64Array(W + 1);
  const take = new Uint8Array(useful.length * (W + 1));
  for (let k = 0; k < useful.length; k++) {
    const wk = w[k];
    const gk = useful[k].gain;
    const row = k * (W + 1);
    for (let c = W; c >= wk; c--) {
      const withIt = best[c - wk] + gk;
      if (withIt > best[c]) {
        best[c] = withIt;
        take[row + c] = 1;
      }
    }
  }
  const chosen: string[] = [];
  let c = W;
  for (let k = useful.length - 1; k >= 0; k--) {
    if (take[k * (W + 1) + c]) {
      chosen.push(useful[k].id);
      c -= w[k];
    }
  }
  chosen.reverse();
  const set = new Set(chosen);
  const picked = useful.filter((i) => set.has(i.id));
  return { chosen, totalGain: picked.reduce((s, i) => s + i.gain, 0), totalCost: picked.reduce((s, i) => s + i.cost, 0), unit: u };
}
