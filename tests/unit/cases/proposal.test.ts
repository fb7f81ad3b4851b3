import { describe, expect, it } from 'vitest';
import type { CaseResult, TruckResult } from '@/lib/engine/types';
import { planCapital, type PlanCandidate } from '@/lib/plan';
import { chosenTrucks, proposalGainVsRebuild, proposalPolicies } from '@/lib/cases/proposal';

// Hand-made npvs (USD); the expected policies and sums are worked by hand below.
function truck(id: string, keep: number, rebuild: number, repower: number): TruckResult {
  const opt = (npv: number) => ({ npv }) as TruckResult['options']['keep'];
  return { id, options: { keep: opt(keep), rebuild: opt(rebuild), repower: opt(repower) } } as TruckResult;
}

describe('the proposal', () => {
  const result = { trucks: [truck('A', -12, -10, -7), truck('B', -8, -10, -9), truck('C', -11, -10, -9.5)] } as CaseResult;
  const cands: PlanCandidate[] = [
    { truckId: 'A', gain: 3, profitabilityIndex: 1.5, capital: 5, capitalYear: 1 },
    { truckId: 'C', gain: 0.5, profitabilityIndex: 1.1, capital: 5, capitalYear: 1 },
  ];

  it('repowers the chosen trucks and leaves the others on the better of keep and rebuild', () => {
    // a budget of 5 in year 1 takes A (gain 3) and leaves C (gain 0.5) out
    const plan = planCapital(cands, { 1: 5 }, 1);
    expect(chosenTrucks(plan)).toEqual(['A']);
    const p = proposalPolicies(result, plan);
    expect(p).toEqual({ A: 'repower', B: 'keep', C: 'rebuild' });
    // A: −7 − (−10) = 3; B: −8 − (−10) = 2; C: 0
    expect(proposalGainVsRebuild(result, p)).toBeCloseTo(5, 12);
  });

  it('with no budget every paying repower is in it', () => {
    const plan = planCapital(cands, {}, 1);
    const p = proposalPolicies(result, plan);
    expect(p).toEqual({ A: 'repower', B: 'keep', C: 'repower' });
    expect(proposalGainVsRebuild(result, p)).toBeCloseTo(3 + 2 + 0.5, 12);
  });
});
