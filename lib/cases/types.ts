/** Shapes the case API answers with; shared by route handlers and the client screens. */
import type { CaseResult, EventKind, PolicyKey, PolicyResult, TruckDetail, TruckResult } from '@/lib/engine/types';
import type { CapitalPlan, PlacedSwap, RankedTruck } from '@/lib/plan';
import type { DueSwap } from '@/lib/plan/settings-input';
import type { PlanSettings } from '@/lib/validation/business-case';
import type { FleetYear } from './fleet-years';
import type { DecisionSummary } from './decision-summary';

export type CaseSummaryDto = {
  id: number;
  name: string;
  status: string;
  version: number;
  assumptionSetId: number | null;
  assumptionSetName: string | null;
  truckCount: number;
  plan: PlanSettings;
  /** planned overhaul life by engine type row id that the case adopts in place of the library's; {} when none */
  engineLives: Record<string, number>;
  updatedAt: string;
};

export type TimelineEvent = { kind: EventKind; period: number; month: number; engineAge: number; cost: number; downtimeDays: number };

export type TruckMeta = {
  rowId: number;
  payloadClass: string;
  engineId: string;
  repowerOfferId: string;
  engineHours: number;
  annualHours: number;
  events: Record<PolicyKey, TimelineEvent[]>;
};

export type FleetSummary = {
  trucksByBest: Record<PolicyKey, number>;
  /** capital (positive) of the repowers in the best mix, by period of spend */
  capitalByYear: Array<{ year: number; amount: number }>;
  /** Σ over trucks of (rebuild − best) / the truck's horizon years */
  fuelSavedLitresPerYear: number;
  co2SavedTonnesPerYear: number;
};

export type ScheduledSwap = PlacedSwap & { label: string; dueLabel: string; capitalYear: number | null };

/** The valuation the case's figures are: the expectation over engine failures, or the median failure path (MODEL.md section 11). */
export type Valuation = 'expected' | 'median-path';

/** ΔNPV repower vs rebuild with every repower offer's productivity gain set to 0 (same case, same valuation). */
export type WithoutGainDto = {
  trucks: Record<string, number>;
  fleet: number;
  /** some offer these trucks use has a productivity gain (else the figures equal those with the gain) */
  anyGain: boolean;
};

/**
 * A case evaluated on the server, in full: what exports, the decision pack and
 * the risk routes read (`evaluateStoredCase`).
 */
export type EvaluatedCase = {
  case: CaseSummaryDto;
  valuation: Valuation;
  withoutGain: WithoutGainDto;
  currency: string;
  negativeStyle: 'parentheses' | 'minus';
  result: CaseResult;
  trucks: Record<string, TruckMeta>;
  summary: FleetSummary;
  ranking: RankedTruck[];
  plan: CapitalPlan;
  schedule: ScheduledSwap[];
  /** every swap the programme can plan on time (repower now or at a planned overhaul, no delay) with its planned capital and period: what the budget warnings read */
  dueSwaps: DueSwap[];
  /** the proposal's figures (the decision summary without the drivers and the risk, which its own route adds) */
  proposal: DecisionSummary;
  /** month (1..12) the workspace's fiscal year starts in */
  fiscalYearStartMonth: number;
  /** the fleet year by year, best mix against rebuilding every engine (lib/cases/fleet-years.ts) */
  fleetYears: FleetYear[];
  /** each truck's discount factors by period (the repower policy's; the same for every policy) */
  discountFactors: Record<string, number[]>;
  /** server time to build and evaluate the case, ms */
  evaluatedMs: number;
};

/** A policy's figures without the by-year cost breakdown (the case pages never read it). */
export type SlimPolicyResult = Omit<PolicyResult, 'breakdown'>;
export type SlimTruckResult = Omit<TruckResult, 'options'> & { options: Record<PolicyKey, SlimPolicyResult> };
export type SlimCaseResult = Omit<CaseResult, 'trucks'> & { trucks: SlimTruckResult[] };

/**
 * What the case result route answers (lib/cases/result-cache.ts): the
 * evaluated case with each policy's by-year breakdown left out, which the
 * results pages do not read (the truck route has the per-period detail).
 */
export type CaseResultDto = Omit<EvaluatedCase, 'result'> & { result: SlimCaseResult };

export type TruckResultDto = {
  case: CaseSummaryDto;
  valuation: Valuation;
  withoutGain: WithoutGainDto;
  currency: string;
  negativeStyle: 'parentheses' | 'minus';
  result: TruckResult;
  detail: TruckDetail;
  meta: TruckMeta;
};
