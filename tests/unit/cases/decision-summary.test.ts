import { describe, expect, it } from 'vitest';
import type { CaseResult, TruckResult } from '@/lib/engine/types';
import type { CaseFileInput } from '@/lib/validation/case';
import type { CapitalPlan } from '@/lib/plan';
import { buildDecisionSummary, proposalIncrementalFlows } from '@/lib/cases/decision-summary';

// Hand-made trucks over two years at r = 10 %, end-of-year discounting (DF 1, 1/1.1, 1/1.21).
// Every npv below is worked by hand from the cash flows beside it.
function option(cashFlows: number[], capital: number[], fuel = 1000, co2 = 2.7) {
  const df = [1, 1 / 1.1, 1 / 1.21];
  const npv = cashFlows.reduce((s, c, y) => s + c * df[y], 0);
  return { npv, cashFlows, breakdown: capital.map((c) => ({ capital: c })), fuelLitres: fuel, co2Tonnes: co2 } as unknown as TruckResult['options']['keep'];
}
function truck(id: string, keep: ReturnType<typeof option>, rebuild: ReturnType<typeof option>, repower: ReturnType<typeof option>): TruckResult {
  return { id, horizonYears: 2, options: { keep, rebuild, repower } } as TruckResult;
}

// A: repower (−110, 40, 40) vs rebuild (−10, −20, −20): ΔCF (−100, 60, 60), Δnpv = −100 + 60/1.1 + 60/1.21 = 4.1322
// B: keep (−5, −15, −15) vs rebuild (−5, −20, −20): ΔCF (0, 5, 5), Δnpv = 5/1.1 + 5/1.21 = 8.6777; its repower loses
// C: repower gains 2 on rebuild (npv −18 vs −20) for 50 of capital in period 0, but the budget leaves it out
const A = truck('A', option([-60, 0, 0], [0, 0, 0]), option([-10, -20, -20], [0, 0, 0]), option([-110, 40, 40], [-100, 0, 0], 700, 1.89));
const B = truck('B', option([-5, -15, -15], [0, 0, 0], 1000), option([-5, -20, -20], [0, 0, 0], 1000), option([-50, 0, 0], [-40, 0, 0]));
const C = truck('C', option([-30, 0, 0], [0, 0, 0]), option([-20, 0, 0], [0, 0, 0]), option([-18, 0, 0], [-50, 0, 0]));
const npv = (t: TruckResult, p: 'keep' | 'rebuild' | 'repower') => t.options[p].npv;
const trucks = [A, B, C];
const result = {
  format: 'case-result/1',
  name: 'hand',
  trucks,
  fleet: {
    npv: {
      keep: trucks.reduce((s, t) => s + npv(t, 'keep'), 0),
      rebuild: trucks.reduce((s, t) => s + npv(t, 'rebuild'), 0),
      repower: trucks.reduce((s, t) => s + npv(t, 'repower'), 0),
      // best: A repower, B keep, C repower
      best: npv(A, 'repower') + npv(B, 'keep') + npv(C, 'repower'),
    },
  },
} as unknown as CaseResult;
const file = { assumptions: { discountRate: 0.1, timing: 'end-of-year', depreciation: { method: 'straight-line', years: 5 } } } as unknown as CaseFileInput;
// the proposal's plan (as the fleet programme would give it): A chosen within period 0's budget of 100, C left out
const gainA = npv(A, 'repower') - npv(A, 'rebuild');
const plan: CapitalPlan = {
  years: [{ year: 0, budget: 100, chosen: [{ truckId: 'A', gain: gainA, profitabilityIndex: null, capital: 100, capitalYear: 0 }], leftOut: [{ truckId: 'C', gain: 2, capital: 50, extraBudget: 50 }], spent: 100, gain: gainA }],
  notWorthIt: [],
  totalGain: gainA,
  totalSpent: 100,
};

const summary = buildDecisionSummary({
  caseId: 7,
  caseName: 'Hand case',
  status: 'submitted',
  source: 'submitted',
  currency: 'USD',
  fiscalYearStartMonth: 7,
  planStartMonth: '2027-01',
  file,
  result,
  plan,
  policies: { A: 'repower', B: 'keep', C: 'rebuild' },
  drivers: [],
  risk: null,
});

describe('the decision summary (hand-worked figures)', () => {
  it('asks the chosen capital in the fiscal year of its period', () => {
    // period 0 is 2027-01; with a July fiscal start that is in FY2027 (July 2026 – June 2027)
    expect(summary.capitalByFiscalYear).toEqual([{ fiscalYear: 'FY2027', capital: 100, budget: 100, trucks: ['A'] }]);
    expect(summary.totalCapital).toBe(100);
    expect(summary.chosenTrucks).toEqual(['A']);
    expect(summary.policies).toEqual({ A: 'repower', B: 'keep', C: 'rebuild' });
  });

  it('gives the gain against rebuilding every engine and the comparisons, already subtracted', () => {
    // ΔCF = (−100, 65, 65): −100 + 65/1.1 + 65/1.21 = 12.80992
    expect(summary.gainVsRebuildAll).toBeCloseTo(12.80992, 4);
    // best mix adds C's 2: 14.80992; the proposal is 2 short of it
    expect(summary.bestMixGain).toBeCloseTo(14.80992, 4);
    expect(summary.gainVsBestMix).toBeCloseTo(-2, 9);
    // repower all: A +4.13223, B −50 − (−39.71074) = −10.28926, C +2 → −4.15703
    expect(summary.repowerAllGain).toBeCloseTo(-4.15703, 4);
  });

  it('IRR, MIRR and paybacks are those of the incremental flow (−100, 65, 65)', () => {
    expect(proposalIncrementalFlows(result, summary.policies).delta).toEqual([-100, 65, 65]);
    // 65x² + 65x − 100 = 0, x = 1/(1+i): x = (−65 + √30225)/130 = 0.837334, i = 0.194266
    expect(summary.irr).toBeCloseTo(0.194266, 5);
    // MIRR at 10 %: √((65·1.1 + 65)/100) − 1 = √1.365 − 1 = 0.168332
    expect(summary.mirr).toBeCloseTo(0.168332, 5);
    // payback: cum −100, −35, +30 → 1 + 35/65 = 1.538462
    expect(summary.payback).toBeCloseTo(1.538462, 5);
    // discounted: −100, 59.0909, 53.7190 → 1 + 40.9091/53.7190 = 1.761538
    expect(summary.discountedPayback).toBeCloseTo(1.761538, 5);
  });

  it('fuel and CO2 saved a year against rebuilding every engine', () => {
    // A: (1000 − 700)/2 years = 150 L/yr; B keep burns the same as rebuild; C rebuilds
    expect(summary.fuelSavedLitresPerYear).toBeCloseTo(150, 9);
    expect(summary.co2SavedTonnesPerYear).toBeCloseTo((2.7 - 1.89) / 2, 9);
  });

  it('lists what the budget left out and what each forgoes', () => {
    expect(summary.leftOut).toEqual([
      { truckId: 'C', capital: 50, gainForgone: 2, reason: 'over the FY2027 budget', extraBudget: 50, fiscalYear: 'FY2027' },
    ]);
    expect(summary.notWorthIt).toEqual([]);
    expect(summary.risk).toBeNull();
    expect(summary.source).toBe('submitted');
    expect(summary.valuation).toBe('expected');
  });

});

describe('the drivers that swing the proposal', () => {
  it('run a tornado on the proposal gain with its policies fixed (one-truck worked example)', async () => {
    const { readFileSync } = await import('node:fs');
    const { evaluateCase, validateCase } = await import('@/lib/engine');
    const { makeProposalEvaluator, proposalTopDrivers } = await import('@/lib/cases/decision-summary');
    const { proposalGainVsRebuild } = await import('@/lib/cases/proposal');
    const v = validateCase(JSON.parse(readFileSync('scenarios/one-truck.json', 'utf8')));
    if (!v.ok) throw new Error('scenario invalid');
    const res = evaluateCase(v.value);
    const policies = { [res.trucks[0].id]: 'repower' as const };
    // with no driver changed the evaluator is the proposal's gain by definition (npv(repower) − npv(rebuild))
    expect(makeProposalEvaluator(v.value, policies).baseValue).toBeCloseTo(proposalGainVsRebuild(res, policies), 3);
    const rows = proposalTopDrivers(v.value, policies);
    expect(rows).toHaveLength(3);
    for (const r of rows) expect(r.swing).toBeCloseTo(Math.abs(r.high - r.low), 6);
    expect(rows[0].swing).toBeGreaterThanOrEqual(rows[1].swing);
    expect(rows[1].swing).toBeGreaterThanOrEqual(rows[2].swing);
    // ±20 % around the base value
    expect(rows[0].driverLow).toBeCloseTo(rows[0].base * 0.8, 9);
  });
});
