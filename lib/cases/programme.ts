import 'server-only';
/**
 * A stored case's fleet programme (issue 15): every truck's timing options
 * valued in expectation by the engine, solved as one MILP under the plan's
 * budgets (by period of spend) and the shop's capacity by month
 * (lib/plan/programme-case.ts, lib/plan/programme.ts).
 *
 * Periods are the budgets' own index: period 0 (now) and each year of the
 * horizon has its own budget, labelled by the fiscal year it starts in
 * (lib/plan/fiscal-year.ts). Capacity: `swapsPerMonth` in every month of the
 * horizon unless `capacityByMonth` says otherwise (0 = shutdown); months
 * past the horizon have no limit (no option plans a swap there).
 *
 * Solving takes a few hundred milliseconds for the demo fleet: the answer is
 * kept per case and inputs (the case file and the plan settings, hashed), so
 * the plan page, the proposal and the approval read one computation.
 */
import { createHash } from 'node:crypto';
import type { Access } from '@/lib/auth/access';
import { horizonYears, type CaseFile } from '@/lib/engine';
import { monthLabel, periodMonths, periodName } from '@/lib/plan';
import { planProgramme, type CaseProgramme } from '@/lib/plan/programme-case';
import type { TimingOption } from '@/lib/engine/timing';
import type { PlanSettings } from '@/lib/validation/business-case';
import { DEFAULT_MAX_DELAY_MONTHS } from '@/lib/validation/business-case';
import { loadValidCase } from './evaluate';
import type { ProgrammeDto, ProgrammeOptionDto } from './programme-types';

const YEAR_MONTHS = 12;
const CACHE_SIZE = 32;
const cache = new Map<string, Promise<CaseProgramme>>();

/** Budgets by period 0…periods−1 from the plan's settings (null: no limit). */
export function budgetsByPeriod(plan: PlanSettings, periods: number): (number | null)[] {
  return Array.from({ length: periods }, (_, p) => plan.budgets[String(p)] ?? null);
}

/** Swaps allowed in months 0…months−1: the plan's swaps per month, or its override for that month. */
export function capacityByMonth(plan: PlanSettings, months: number): number[] {
  return Array.from({ length: months }, (_, m) => plan.capacityByMonth?.[String(m)] ?? plan.swapsPerMonth);
}

/** Periods of the case (0 = now … the longest horizon). */
export function periodsOf(file: CaseFile): number {
  const cap = file.assumptions.horizonYears ?? null;
  return Math.max(1, ...file.trucks.map((t) => horizonYears(t.remainingLifeHours, t.annualHours, cap))) + 1;
}

/** The programme of a case file under its plan settings; cached by the inputs. */
export function programmeOf(file: CaseFile, plan: PlanSettings): Promise<CaseProgramme> {
  const periods = periodsOf(file);
  const key = createHash('sha256').update(JSON.stringify(file)).update('\0').update(JSON.stringify(plan)).digest('hex');
  const hit = cache.get(key);
  if (hit) {
    cache.delete(key);
    cache.set(key, hit);
    return hit;
  }
  const startMonth = plan.startMonth;
  const solving = planProgramme(file, {
    budgets: budgetsByPeriod(plan, periods),
    yearLabels: Array.from({ length: periods }, (_, p) => periodName(startMonth, p)),
    capacity: capacityByMonth(plan, (periods - 1) * YEAR_MONTHS),
    maxDelayMonths: plan.maxDelayMonths ?? DEFAULT_MAX_DELAY_MONTHS,
    fiscalYearOfPeriod: (p) => p,
  });
  cache.set(key, solving);
  solving.catch(() => cache.delete(key));
  while (cache.size > CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  return solving;
}

function optionDto(o: TimingOption, startMonth: string): ProgrammeOptionDto {
  return {
    key: o.key,
    label: o.label,
    kind: o.kind,
    k: o.kind === 'event' ? o.k : null,
    delayMonths: o.delayMonths,
    month: o.swapMonth,
    monthLabel: o.swapMonth === null ? null : monthLabel(startMonth, o.swapMonth),
    capitalPeriod: o.swapPeriod,
    plannedCapital: o.plannedCapital.reduce((a, b) => a + b, 0),
    npv: o.npv,
  };
}

/** The plan page's view of a programme (pure given its inputs). */
export function programmeDto(
  file: CaseFile,
  plan: PlanSettings,
  programme: CaseProgramme,
  meta: { caseId: number; caseVersion: number; currency: string; negativeStyle: string; fiscalYearStartMonth: number; rowIds: Map<string, number> },
): ProgrammeDto {
  const { result, options } = programme;
  const start = plan.startMonth;
  const fy = meta.fiscalYearStartMonth;
  const periods = periodsOf(file);
  const budgets = budgetsByPeriod(plan, periods);
  const capacity = capacityByMonth(plan, (periods - 1) * YEAR_MONTHS);
  const rebuildNpv = options.reduce((s, t) => s + (t.options.find((o) => o.kind === 'rebuild')?.npv ?? 0), 0);
  const cheapest = new Array<number | null>(periods).fill(null);
  for (const t of options)
    for (const o of t.options) {
      if (o.swapPeriod === null || o.delayMonths > 0 || o.swapPeriod >= periods) continue;
      const c = o.plannedCapital[o.swapPeriod] ?? 0;
      const was = cheapest[o.swapPeriod];
      if (was === null || c < was) cheapest[o.swapPeriod] = c;
    }
  const trucks = result.ok
    ? result.choices.map((choice, i) => {
        const all = options[i].options;
        const chosen = all.find((o) => o.key === choice.option.key) as TimingOption;
        const best = all.find((o) => o.key === choice.best.key) as TimingOption;
        return {
          truckId: choice.truckId,
          rowId: meta.rowIds.get(choice.truckId) ?? 0,
          chosen: optionDto(chosen, start),
          best: optionDto(best, start),
          cost: choice.cost,
          forcedDelay: choice.forcedDelay,
          alternatives: all.filter((o) => o.key !== chosen.key).map((o) => optionDto(o, start)).sort((a, b) => b.npv - a.npv),
        };
      })
    : [];
  return {
    caseId: meta.caseId,
    caseVersion: meta.caseVersion,
    currency: meta.currency,
    negativeStyle: meta.negativeStyle,
    fiscalYearStartMonth: fy,
    planStartMonth: start,
    settings: plan,
    ok: result.ok,
    message: result.message,
    status: result.status,
    gap: result.gap,
    seconds: result.seconds,
    objective: result.objective,
    gainVsRebuild: result.ok ? result.objective - rebuildNpv : Number.NaN,
    periods: budgets.map((budget, p) => ({
      period: p,
      label: periodName(start, p, fy),
      months: periodMonths(start, p),
      budget,
      plannedCapital: programme.byFiscalYear[p]?.plannedCapital ?? 0,
      expectedCapital: programme.byFiscalYear[p]?.expectedCapital ?? 0,
      expectedCashFlow: programme.byFiscalYear[p]?.expectedCashFlow ?? 0,
      cheapestDueSwap: cheapest[p],
    })),
    months: capacity.map((cap, m) => ({ month: m, label: monthLabel(start, m), capacity: cap, used: result.swapsByMonth[m] ?? 0, shutdown: cap === 0 })),
    trucks,
    binding: result.binding.map((b) => ({ ...b, label: b.kind === 'budget' ? periodName(start, b.index, fy) : monthLabel(start, b.index) })),
  };
}

/** GET …/programme: the stored case's programme under its saved plan settings. */
export async function evaluateStoredProgramme(access: Access, id: number): Promise<ProgrammeDto> {
  const { row, file, truckRows } = await loadValidCase(access, id);
  const programme = await programmeOf(file, row.plan);
  return programmeDto(file, row.plan, programme, {
    caseId: row.id,
    caseVersion: row.version,
    currency: access.workspace.currency,
    negativeStyle: access.workspace.settings.negativeStyle,
    fiscalYearStartMonth: access.workspace.settings.fiscalYearStartMonth,
    rowIds: new Map([...truckRows].map(([unit, r]) => [unit, r.id])),
  });
}
