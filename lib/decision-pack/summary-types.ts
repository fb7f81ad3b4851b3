/**
 * The decision summary's shape, as `lib/cases/decision-summary.ts` will export
 * it. Until that module is merged, the pack builds one itself
 * (`./interim-summary.ts`).
 */
import type { Valuation } from '@/lib/cases/types';

export interface DecisionSummary {
  caseId: number;
  caseName: string;
  status: string;
  /** which figures: the frozen record (approved), the submitted snapshot, or live data (draft) */
  source: 'frozen' | 'submitted' | 'live';
  valuation: Valuation;
  currency: string;
  /** 1 = January */
  fiscalYearStartMonth: number;
  capitalByFiscalYear: { fiscalYear: number; capital: number; budget: number | null; trucks: string[] }[];
  totalCapital: number;
  gainVsRebuildAll: number;
  gainVsBestMix: number;
  bestMixGain: number;
  repowerAllGain: number;
  irr: number | null;
  mirr: number | null;
  payback: number | null;
  discountedPayback: number | null;
  fuelSavedLitresPerYear: number;
  co2SavedTonnesPerYear: number;
  risk: null | {
    runId: number;
    label: string;
    iterations: number;
    seed: number;
    author: string;
    finishedAt: string;
    probabilityOfLoss: number;
    p10: number;
    p50: number;
    p90: number;
  };
  leftOut: { truckId: string; capital: number; gainForgone: number; reason: string }[];
  topDrivers: { label: string; low: number; high: number; swing: number }[];
  chosenTrucks: string[];
}
