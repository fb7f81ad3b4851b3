/**
 * A case's fleet programme: every truck's timing options valued by the
 * engine (lib/engine/timing.ts), mapped onto fiscal years and shop months,
 * and solved as one MILP (programme.ts). What the plan page calls.
 *
 * Fiscal years: the caller gives `fiscalYearOfPeriod` (engine period → index
 * into `budgets`, or null for a period outside the budgets). The default
 * puts period 0 ("now") and period 1 (the first year from today) in fiscal
 * year 0 and period y in fiscal year y − 1: the engine's year 1 is the
 * twelve months from today, as the current fiscal year's budget reads it.
 *
 * Delays: a truck's (k, d) options for d = 1 … maxDelayMonths are the
 * programme's way to move a swap later when the shop is full; each is valued
 * by the engine (the old engine runs on, a failure in the delay brings the
 * swap forward), so a forced delay costs what the engine says it costs.
 */
import { CaseValidationError, validateCase, type CaseFileInput } from '@/lib/validation/case';
import { timingOptions, truckSetupOf, type TimingOption } from '@/lib/engine/timing';
import { solveProgramme, type ProgrammeInput, type ProgrammeResult } from './programme';

export interface ProgrammeSettings {
  budgets: (number | null)[];
  yearLabels?: string[];
  capacity: number[];
  /** repower at the k-th planned event for k up to this (default 3) */
  maxK?: number;
  /** delays of 0 … this many months (default 6) */
  maxDelayMonths?: number;
  fiscalYearOfPeriod?: (period: number) => number | null;
}

export interface CaseProgramme {
  /** every truck's options, in the order of the case's trucks (the alternatives the page lists) */
  options: { truckId: string; options: TimingOption[] }[];
  result: ProgrammeResult;
  /** per fiscal year of the chosen plan: planned capital, expected capital and expected cash flow (Σ over trucks) */
  byFiscalYear: { plannedCapital: number; expectedCapital: number; expectedCashFlow: number }[];
}

export const defaultFiscalYearOfPeriod = (period: number): number => Math.max(0, period - 1);

/** Value every truck's options and solve the programme (the case is validated first). */
export async function planProgramme(c: CaseFileInput, settings: ProgrammeSettings): Promise<CaseProgramme> {
  const v = validateCase(c);
  if (!v.ok) throw new CaseValidationError(v.problems);
  const valid = v.value;
  const fy = settings.fiscalYearOfPeriod ?? defaultFiscalYearOfPeriod;
  const years = settings.budgets.length;
  const perYear = (amounts: number[]) => {
    const out = new Array<number>(years).fill(0);
    amounts.forEach((a, period) => {
      const i = fy(period);
      if (i !== null && i >= 0 && i < years) out[i] += a;
    });
    return out;
  };
  const options = valid.trucks.map((t) => {
    const setup = truckSetupOf(valid, t.id);
    return { truckId: t.id, options: timingOptions(setup, { maxK: settings.maxK ?? 3, maxDelayMonths: settings.maxDelayMonths ?? 6 }) };
  });
  const input: ProgrammeInput = {
    trucks: options.map((t) => ({
      id: t.truckId,
      options: t.options.map((o) => ({
        key: o.key, label: o.label, month: o.swapMonth, delayMonths: o.delayMonths, npv: o.npv, capitalByYear: perYear(o.plannedCapital),
      })),
    })),
    budgets: settings.budgets,
    yearLabels: settings.yearLabels,
    capacity: settings.capacity,
  };
  const result = await solveProgramme(input);
  const byFiscalYear = Array.from({ length: years }, () => ({ plannedCapital: 0, expectedCapital: 0, expectedCashFlow: 0 }));
  if (result.ok) {
    result.choices.forEach((choice, i) => {
      const o = options[i].options.find((x) => x.key === choice.option.key) as TimingOption;
      perYear(o.plannedCapital).forEach((a, y) => (byFiscalYear[y].plannedCapital += a));
      perYear(o.result.breakdown.map((b) => -b.capital)).forEach((a, y) => (byFiscalYear[y].expectedCapital += a));
      perYear(o.result.cashFlows).forEach((a, y) => (byFiscalYear[y].expectedCashFlow += a));
    });
  }
  return { options, result, byFiscalYear };
}
