import { describe, expect, it } from 'vitest';
import type { CaseResult, PolicyResult, TruckResult } from '@/lib/engine/types';
import type { CapitalPlan } from '@/lib/plan';
import { chosenTrucks, proposalGainVsRebuild, proposalPolicyResult } from '@/lib/cases/proposal';

// Hand-made npvs (USD); the expected sums are worked by hand below.
function truck(id: string, keep: number, rebuild: number, repower: number): TruckResult {
  const opt = (npv: number) => ({ npv }) as TruckResult['options']['keep'];
  return { id, options: { keep: opt(keep), rebuild: opt(rebuild), repower: opt(repower) } } as TruckResult;
}

describe('the proposal', () => {
  const result = { trucks: [truck('A', -12, -10, -7), truck('B', -8, -10, -9), truck('C', -11, -10, -9.5)] } as CaseResult;
  // the fleet programme chose A in year 1 and C in year 2 (a literal plan: the programme's own tests cover the choice)
  const cand = (truckId: string, gain: number, capitalYear: number) => ({ truckId, gain, profitabilityIndex: null, capital: 5, capitalYear });
  const plan: CapitalPlan = {
    years: [
      { year: 1, budget: 5, chosen: [cand('A', 3, 1)], leftOut: [], spent: 5, gain: 3 },
      { year: 2, budget: null, chosen: [cand('C', 0.5, 2)], leftOut: [], spent: 5, gain: 0.5 },
    ],
    notWorthIt: [],
    totalGain: 3.5,
    totalSpent: 10,
  };

  it('lists the chosen trucks in the plan\'s order', () => {
    expect(chosenTrucks(plan)).toEqual(['A', 'C']);
  });

  it('sums each truck\'s policy against rebuilding it', () => {
    // A: −7 − (−10) = 3; B kept: −8 − (−10) = 2; C rebuilt: 0
    expect(proposalGainVsRebuild(result, { A: 'repower', B: 'keep', C: 'rebuild' })).toBeCloseTo(5, 12);
    // C repowered as well: + (−9.5 − (−10)) = 0.5
    expect(proposalGainVsRebuild(result, { A: 'repower', B: 'keep', C: 'repower' })).toBeCloseTo(5.5, 12);
    // a truck the policies do not name is rebuilt
    expect(proposalGainVsRebuild(result, { A: 'repower' })).toBeCloseTo(3, 12);
  });

  it('reads a repowered truck at its chosen timing where the programme gave one', () => {
    const later = { npv: -8.5 } as PolicyResult;
    expect(proposalPolicyResult(result.trucks[0], { A: 'repower' }, { A: later })).toBe(later);
    expect(proposalPolicyResult(result.trucks[1], { B: 'keep' }, { A: later }).npv).toBe(-8);
    // A at the later timing: −8.5 − (−10) = 1.5; B: 2
    expect(proposalGainVsRebuild(result, { A: 'repower', B: 'keep' }, { A: later })).toBeCloseTo(3.5, 12);
  });
});
