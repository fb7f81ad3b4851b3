import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { planCapital, solveKnapsack, type PlanCandidate } from '@/lib/plan';

/** Every subset enumerated: the best total gain with each year's spend within its budget. */
function bruteForce(cands: PlanCandidate[], budgets: Record<number, number | null>): number {
  let best = 0;
  for (let mask = 0; mask < 1 << cands.length; mask++) {
    const spend = new Map<number, number>();
    let gain = 0;
    for (let i = 0; i < cands.length; i++) {
      if (!(mask & (1 << i))) continue;
      spend.set(cands[i].capitalYear, (spend.get(cands[i].capitalYear) ?? 0) + cands[i].capital);
      gain += cands[i].gain;
    }
    const fits = [...spend].every(([y, s]) => budgets[y] == null || s <= (budgets[y] as number));
    if (fits && gain > best) best = gain;
  }
  return best;
}

const UNIT = 1000;
// Capital in whole thousands (the plan's resolution), gains of either sign, spends over four years.
const candidate = (i: number) =>
  fc.record({
    capital: fc.integer({ min: 1, max: 3000 }).map((k) => k * UNIT),
    gain: fc.double({ min: -500_000, max: 3_000_000, noNaN: true }),
    capitalYear: fc.integer({ min: 0, max: 3 }),
  }).map((c) => ({ ...c, truckId: `T${i}`, profitabilityIndex: null }));
const fleet = fc.integer({ min: 0, max: 11 }).chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => candidate(i))));
const budgets = fc.tuple(...[0, 1, 2, 3].map(() => fc.option(fc.integer({ min: 0, max: 6000 }).map((k) => k * UNIT), { nil: null })));

describe('capital plan', () => {
  it('finds the same total gain as enumerating every subset, on small random fleets', () => {
    fc.assert(
      fc.property(fleet, budgets, (cands, b) => {
        const bud = Object.fromEntries(b.map((v, y) => [y, v]));
        const plan = planCapital(cands, bud, UNIT);
        expect(plan.totalGain).toBeCloseTo(bruteForce(cands, bud), 4);
        for (const y of plan.years) {
          if (y.budget !== null) expect(y.spent).toBeLessThanOrEqual(y.budget);
          expect(y.chosen.every((c) => c.capitalYear === y.year && c.gain > 0)).toBe(true);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('never spends more than the budget when costs are not whole units (costs rounded up)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.record({ cost: fc.double({ min: 1, max: 2e6, noNaN: true }), gain: fc.double({ min: 1, max: 1e6, noNaN: true }) }), { maxLength: 10 }),
        fc.double({ min: 0, max: 5e6, noNaN: true }),
        (items, budget) => {
          const a = solveKnapsack(items.map((x, i) => ({ id: `i${i}`, ...x })), budget, UNIT);
          expect(a.totalCost).toBeLessThanOrEqual(budget);
        },
      ),
    );
  });

  it('beats greedy by profitability index where greedy loses', () => {
    // Budget 10 M. A has the best PI (2.2) but blocks B + C (PI 2.1 each), together worth more.
    const cands: PlanCandidate[] = [
      { truckId: 'A', capital: 6e6, gain: 7.2e6, profitabilityIndex: 2.2, capitalYear: 1 },
      { truckId: 'B', capital: 5e6, gain: 5.5e6, profitabilityIndex: 2.1, capitalYear: 1 },
      { truckId: 'C', capital: 5e6, gain: 5.5e6, profitabilityIndex: 2.1, capitalYear: 1 },
    ];
    const budget = 10e6;
    let greedy = 0;
    let left = budget;
    for (const c of [...cands].sort((a, b) => (b.profitabilityIndex ?? 0) - (a.profitabilityIndex ?? 0))) {
      if (c.capital <= left) {
        greedy += c.gain;
        left -= c.capital;
      }
    }
    expect(greedy).toBe(7.2e6);
    const plan = planCapital(cands, { 1: budget });
    expect(plan.years[0].chosen.map((c) => c.truckId).sort()).toEqual(['B', 'C']);
    expect(plan.totalGain).toBe(11e6);
    // A is left out: adding it to B + C needs its full 6 M (nothing is left unspent).
    expect(plan.years[0].leftOut).toEqual([{ truckId: 'A', gain: 7.2e6, capital: 6e6, extraBudget: 6e6 }]);
  });

  it('takes every paying repower in a year without a budget, and lists the ones that do not pay apart', () => {
    const plan = planCapital(
      [
        { truckId: 'A', capital: 1e6, gain: 2e5, profitabilityIndex: 1.2, capitalYear: 2 },
        { truckId: 'B', capital: 1e6, gain: -1e5, profitabilityIndex: 0.9, capitalYear: 2 },
      ],
      {},
    );
    expect(plan.years).toHaveLength(1);
    expect(plan.years[0]).toMatchObject({ year: 2, budget: null, spent: 1e6, gain: 2e5 });
    expect(plan.notWorthIt.map((c) => c.truckId)).toEqual(['B']);
  });

  it('says the extra budget a left-out repower needs beyond what is unspent', () => {
    const plan = planCapital(
      [
        { truckId: 'A', capital: 3e6, gain: 9e5, profitabilityIndex: null, capitalYear: 1 },
        { truckId: 'B', capital: 2.5e6, gain: 4e5, profitabilityIndex: null, capitalYear: 1 },
      ],
      { 1: 4e6 },
    );
    expect(plan.years[0].chosen.map((c) => c.truckId)).toEqual(['A']);
    // 1 M unspent, so B (2.5 M) needs 1.5 M more.
    expect(plan.years[0].leftOut[0]).toMatchObject({ truckId: 'B', extraBudget: 1.5e6 });
  });
});
