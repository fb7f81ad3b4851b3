/** A hand-made decision pack (invented figures) for renderer tests. */
import type { DecisionPackData } from '@/lib/decision-pack/types';

export function packFixture(o: { trucks?: number; approved?: boolean; actuals?: boolean } = {}): DecisionPackData {
  const n = o.trucks ?? 6;
  const ids = Array.from({ length: n }, (_, i) => `HT-${String(i + 1).padStart(3, '0')}`);
  return {
    summary: {
      caseId: 7, caseName: 'North pit repower 2027', status: o.approved ? 'approved' : 'submitted', source: o.approved ? 'frozen' : 'submitted',
      valuation: 'expected', currency: 'AUD', fiscalYearStartMonth: 7, planStartMonth: '2026-12',
      capitalByFiscalYear: [
        { fiscalYear: 'FY2027', capital: 2_400_000, budget: 2_500_000, trucks: ids.slice(0, 2) },
        { fiscalYear: 'FY2028', capital: 1_200_000, budget: null, trucks: ids.slice(2, 3) },
      ],
      totalCapital: 3_600_000, gainVsRebuildAll: 1_234_500, gainVsBestMix: -150_000, bestMixGain: 1_384_500, repowerAllGain: -420_000,
      irr: 0.1834, mirr: 0.121, payback: 3.4, discountedPayback: 4.6, fuelSavedLitresPerYear: 812_000, co2SavedTonnesPerYear: 2_180,
      risk: o.approved ? { runId: '3f2a9c0e-77aa-4c1e-9d1b-0a1b2c3d4e5f', label: 'ΔNPV of the proposal against rebuilding every engine', sampleFailures: true, startedAt: '2026-11-30T09:14:00.000Z', iterations: 2000, seed: 42, author: 'Ana Analyst', finishedAt: '2026-11-30T09:15:00.000Z', probabilityOfLoss: 0.087, p10: -120_000, p50: 1_150_000, p90: 2_400_000 } : null,
      leftOut: [{ truckId: ids[n - 1], capital: 1_100_000, gainForgone: 90_000, reason: 'over the FY2027 budget', extraBudget: 1_000_000, fiscalYear: 'FY2027' }],
      notWorthIt: [],
      topDrivers: [{ label: 'Fuel price', low: 300_000, high: 2_100_000, swing: 1_800_000, driver: 'fuelPrice', unit: 'AUD/L', base: 1.45, driverLow: 1.16, driverHigh: 1.74 }],
      chosenTrucks: ids.slice(0, 3),
      policies: Object.fromEntries(ids.map((id, i) => [id, i < 3 ? 'repower' : 'rebuild'])),
    },
    workspaceName: 'Demo mine',
    negativeStyle: 'minus',
    generatedAt: '2026-12-03T12:00:00.000Z',
    assumptionSetName: 'Base 2026',
    chart: [
      { fiscalYear: 'FY2027', capital: 2_400_000, cashFlow: -1_900_000 },
      { fiscalYear: 'FY2028', capital: 1_200_000, cashFlow: -600_000 },
      { fiscalYear: 'FY2029', capital: 0, cashFlow: 900_000 },
      { fiscalYear: 'FY2030', capital: 0, cashFlow: 1_100_000 },
    ],
    ranking: ids.map((id, i) => ({ rank: i + 1, truckId: id, policy: i < 3 ? 'repower' : 'rebuild', gain: 600_000 - i * 50_000, profitabilityIndex: 1.4 - i * 0.05, capital: 1_200_000, fiscalYear: i < 2 ? 'FY2027' : 'FY2028', inProposal: i < 3 })),
    schedule: ids.slice(0, 3).map((id, i) => ({ truckId: id, month: `2027-0${i + 1}`, due: `2027-0${i + 2}`, movedEarlier: i === 1, late: false, fiscalYear: 'FY2027' })),
    shopCapacityPerMonth: 1,
    assumptions: [{ label: 'Discount rate (real)', value: '8.0 %' }, { label: 'Fuel price (AUD/L)', value: '1.45' }],
    trail: [
      { at: '2026-11-30T10:00:00.000Z', who: 'Ana Analyst', action: 'submit', comment: 'For the December committee' },
      ...(o.approved ? [{ at: '2026-12-01T08:00:00.000Z', who: 'Pat Approver', action: 'approve', comment: '' }] : []),
    ],
    approvalsRequired: 1,
    frozen: o.approved ? { hash: 'a'.repeat(64), verifies: true } : null,
    actuals: o.actuals
      ? {
          from: '2027-01', to: '2027-12', tolerancePercent: 5,
          fleet: { hours: 70_000, forecastHours: 72_000, litres: 21_000_000, expectedLitres: 20_500_000, capital: 2_600_000, plannedCapital: 2_500_000, saving: 1_100_000, forecastSaving: 1_400_000, daysDown: 30, expectedDaysDown: 28 },
          trucks: [
            { unit: 'HT-001', policy: 'repower', hoursVariance: -0.02, burnVariance: 0.08, saving: 300_000, forecastSaving: 520_000, flags: ['burn'] },
            { unit: 'HT-002', policy: 'rebuild', hoursVariance: 0.01, burnVariance: 0.01, saving: 0, forecastSaving: 0, flags: [] },
          ],
        }
      : null,
  };
}
