/**
 * What the decision pack (the PDF of a case's proposal) is drawn from. The
 * renderer (`./render.ts`) is a pure function of a `DecisionPackData`; the
 * server builds one in `./build.ts`.
 */
import type { DecisionSummary } from '@/lib/cases/decision-summary';

export type { DecisionSummary } from '@/lib/cases/decision-summary';

export type PackRankingRow = {
  rank: number;
  truckId: string;
  /** the policy the proposal gives this truck */
  policy: 'keep' | 'rebuild' | 'repower';
  /** npv(repower) − npv(better of keep and rebuild), currency */
  gain: number;
  profitabilityIndex: number | null;
  /** the repower's capital, positive, currency */
  capital: number;
  /** fiscal year of the repower's spend ("FY2027"), or null when there is none */
  fiscalYear: string | null;
  /** the proposal repowers it */
  inProposal: boolean;
};

export type PackSwapRow = { truckId: string; month: string; due: string; movedEarlier: boolean; late: boolean; fiscalYear: string | null };

/** One bar group of the fleet chart: the proposal's capital and its net cash flow against rebuilding every engine. */
export type PackChartYear = { fiscalYear: string; capital: number; cashFlow: number };

export type PackAssumption = { label: string; value: string };

/** Plan against actual (an approved case with readings after its approval): lib/readings/plan-vs-actual.ts. */
export type PackActuals = {
  from: string;
  to: string;
  tolerancePercent: number;
  fleet: { hours: number; forecastHours: number; litres: number; expectedLitres: number; capital: number; plannedCapital: number; saving: number; forecastSaving: number; daysDown: number; expectedDaysDown: number };
  trucks: Array<{ unit: string; policy: string; hoursVariance: number | null; burnVariance: number | null; saving: number; forecastSaving: number; flags: string[] }>;
};

export type PackTrailEntry = { at: string; who: string; action: string; comment: string };

export interface DecisionPackData {
  summary: DecisionSummary;
  workspaceName: string;
  negativeStyle: 'parentheses' | 'minus';
  /** ISO time the pack was made */
  generatedAt: string;
  assumptionSetName: string | null;
  chart: PackChartYear[];
  ranking: PackRankingRow[];
  schedule: PackSwapRow[];
  shopCapacityPerMonth: number;
  assumptions: PackAssumption[];
  trail: PackTrailEntry[];
  approvalsRequired: number;
  /** the frozen record's hash once approved, and whether it still verifies */
  frozen: { hash: string; verifies: boolean } | null;
  /** plan against actual, when the case is approved and has readings after its approval; else null */
  actuals: PackActuals | null;
}
