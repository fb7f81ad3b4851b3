/**
 * What the plan page reads of a case's fleet programme
 * (GET /api/workspaces/[workspace]/cases/[id]/programme). Money in the
 * workspace currency, whole units; months counted from the plan's month 0;
 * periods are the engine's years of spend (0 = now, 1 = the first year).
 */
import type { PlanSettings } from '@/lib/validation/business-case';

export interface ProgrammeOptionDto {
  /** "keep", "rebuild", "now", "k1", "k2+d3", … (stable within the truck) */
  key: string;
  label: string;
  kind: 'keep' | 'rebuild' | 'now' | 'event';
  /** the k-th planned event of the current engine (kind "event"), else null */
  k: number | null;
  delayMonths: number;
  /** planned swap month (no failure before it), null without a swap */
  month: number | null;
  /** that month as "YYYY-MM" */
  monthLabel: string | null;
  /** period whose budget carries the planned capital, null without a swap */
  capitalPeriod: number | null;
  /** planned capital (module + install − core credit at that period's prices), 0 without a swap */
  plannedCapital: number;
  /** expected npv of the truck under this option (costs negative) */
  npv: number;
}

export interface ProgrammePeriodDto {
  period: number;
  /** "FY2027 (now)", "FY2028", … */
  label: string;
  /** the months it covers */
  months: string;
  budget: number | null;
  /** planned capital of the chosen plan in this period */
  plannedCapital: number;
  /** expected capital (failures bring swaps forward) and expected cash flow of the chosen plan */
  expectedCapital: number;
  expectedCashFlow: number;
  /** the cheapest on-time swap any truck has planned in this period (null: none) — a budget below it buys nothing */
  cheapestDueSwap: number | null;
}

export interface ProgrammeMonthDto {
  month: number;
  label: string;
  capacity: number;
  used: number;
  shutdown: boolean;
}

export interface ProgrammeTruckDto {
  truckId: string;
  /** the register row (links to the truck page) */
  rowId: number;
  chosen: ProgrammeOptionDto;
  /** the option of highest npv ignoring budgets and the shop */
  best: ProgrammeOptionDto;
  /** best.npv − chosen.npv, ≥ 0: what the constraints cost this truck */
  cost: number;
  /** the chosen swap is later than its due month because the shop or a budget forced it */
  forcedDelay: boolean;
  alternatives: ProgrammeOptionDto[];
}

export interface ProgrammeBindingDto {
  kind: 'budget' | 'capacity';
  /** period (budget) or month (capacity) */
  index: number;
  label: string;
  limit: number;
  used: number;
  /** +1,000,000 of budget or +1 swap */
  relaxBy: number;
  /** the optimum with that relaxation less the optimum (≥ 0) */
  gain: number;
}

export interface ProgrammeDto {
  caseId: number;
  caseVersion: number;
  currency: string;
  negativeStyle: string;
  fiscalYearStartMonth: number;
  planStartMonth: string;
  settings: PlanSettings;
  ok: boolean;
  /** plain words when there is no plan (infeasible or empty input) */
  message: string | null;
  /** the solver's status in plain words ("optimal", "time limit", …) */
  status: string;
  gap: number;
  seconds: number;
  /** Σ over trucks of the chosen options' npv */
  objective: number;
  /** objective − Σ over trucks of the rebuild npv */
  gainVsRebuild: number;
  periods: ProgrammePeriodDto[];
  months: ProgrammeMonthDto[];
  trucks: ProgrammeTruckDto[];
  binding: ProgrammeBindingDto[];
}
