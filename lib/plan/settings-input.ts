/**
 * The plan settings form as text (pure; used in the browser, tested alone).
 *
 * Budgets are typed in thousands of the workspace currency ("USD k", the unit
 * the plan's tables show) and stored in the plan's own unit, whole currency
 * (`PlanSettings.budgets`, e.g. 3,000 k → 3000000). The conversion is a shift
 * of the decimal point in the number's digits, never a float multiplication,
 * so 1,234.5678 k is stored as exactly 1234567.8 (STYLE.md: stored money
 * keeps what was typed).
 *
 * Every figure is read with the shared rule (`parseNumberText`, the
 * workspace's number format) and every message names its field:
 * "FY2027 budget (USD k): enter a number such as 18,950".
 *
 * Shop capacity: `swapsPerMonth` is the default for every month; the grid's
 * months are typed as text, empty meaning the default. Only a month whose
 * value differs from the default is saved (`capacityByMonth`, 0 = shutdown).
 *
 * @example
 * budgetToStored(3000)            // → 3000000
 * storedBudgetText(3000000, 'point') // → "3,000"
 */
import { formatNumberText, parseNumberText, type NumberFormat } from '@/lib/number-input';
import { MAX_BUDGET, MAX_DELAY_MONTHS, planSettingsSchema, type PlanSettings } from '@/lib/validation/business-case';

/** Budgets are typed in thousands: the stored value is 10^3 times the typed one. */
export const BUDGET_DIGITS_SHIFT = 3;
/** The largest budget a field takes, in thousands. */
export const MAX_BUDGET_K = MAX_BUDGET / 1000;
export const MAX_CAPACITY = 100;

export type Problem = { path: string; message: string };

/**
 * `value` × 10^places by moving the decimal point in its shortest decimal
 * form (the digits a typed number had), then read back as a number.
 *
 * @example shiftDecimal(1.005, 3) // → 1005 (1.005 * 1000 is 1004.9999999999999)
 * @example shiftDecimal(2500, -3) // → 2.5
 */
export function shiftDecimal(value: number, places: number): number {
  if (!Number.isFinite(value)) throw new RangeError(`not a finite number: ${value}`);
  if (value === 0) return 0;
  const plain = formatNumberText(Math.abs(value), 'point'); // no exponent, no grouping
  const [whole, fraction = ''] = plain.split('.');
  const digits = whole + fraction;
  const point = whole.length + places;
  let text: string;
  if (point <= 0) text = `0.${'0'.repeat(-point)}${digits}`;
  else if (point >= digits.length) text = digits + '0'.repeat(point - digits.length);
  else text = `${digits.slice(0, point)}.${digits.slice(point)}`;
  const out = Number(text);
  return value < 0 ? -out : out;
}

/** A budget typed in thousands → the stored budget (whole currency). */
export const budgetToStored = (thousands: number): number => shiftDecimal(thousands, BUDGET_DIGITS_SHIFT);
/** A stored budget → thousands, as the tables show it. */
export const storedToBudget = (stored: number): number => shiftDecimal(stored, -BUDGET_DIGITS_SHIFT);

/** A stored budget as the field shows it, in thousands with grouping ("3,000"); empty for no limit. */
export function storedBudgetText(stored: number | null | undefined, format: NumberFormat): string {
  if (stored === null || stored === undefined) return '';
  return formatNumberText(storedToBudget(stored), format, true);
}

/** "FY2027 budget (USD k)": the budget field's label, also the start of its messages. */
export const budgetLabel = (periodName: string, currency: string) => `${periodName} budget (${currency} k)`;
/** "Capacity 2027-03": a month's field in the capacity grid. */
export const capacityLabel = (monthLabel: string) => `Capacity ${monthLabel}`;
export const SWAPS_LABEL = 'Swaps per month';
export const MAX_DELAY_LABEL = 'Most months a swap may be planned late';
export const START_LABEL = 'First month of the plan';

export type ParsedField<T> = { ok: true; value: T } | { ok: false; message: string };

/** A budget field's text → the stored budget (null: empty, no limit), or a message naming the field. */
export function readBudgetText(text: string, format: NumberFormat, label: string): ParsedField<number | null> {
  const r = parseNumberText(text, format, { min: 0, max: MAX_BUDGET_K });
  if (!r.ok) return { ok: false, message: `${label}: ${r.message}` };
  return { ok: true, value: r.value === null ? null : budgetToStored(r.value) };
}

/** A whole number field (swaps, a month's capacity, months of delay); empty is `null`. */
export function readWholeText(text: string, format: NumberFormat, label: string, min: number, max: number): ParsedField<number | null> {
  const r = parseNumberText(text, format, { min, max, integer: true, example: String(min === 0 ? 2 : min + 1) });
  if (!r.ok) return { ok: false, message: `${label}: ${r.message}` };
  return { ok: true, value: r.value };
}

/** A swap the programme can plan on time in a period: one truck's option (now, or at its k-th planned overhaul) with no delay. */
export interface DueSwap {
  truckId: string;
  /** planned capital of the swap, positive, whole currency */
  capital: number;
  /** period of the spend (the budgets' key) */
  period: number;
}

/** The options the programme values per truck (lib/plan/programme-case.ts), as much of them as this needs. */
export interface TruckOptionsLike {
  truckId: string;
  options: Array<{ kind: string; delayMonths: number; swapPeriod: number | null; plannedCapital: number[] }>;
}

/**
 * Every on-time swap of every truck: each option that swaps the engine
 * (repower now or at a planned overhaul) without a planned delay, with its
 * planned capital in the period of the swap (no failure before it). Delayed
 * options are the programme's way round a full shop, not what is due.
 */
export function dueSwapsOf(trucks: TruckOptionsLike[]): DueSwap[] {
  const out: DueSwap[] = [];
  for (const t of trucks)
    for (const o of t.options) {
      if (o.swapPeriod === null || o.delayMonths > 0 || o.kind === 'keep' || o.kind === 'rebuild') continue;
      out.push({ truckId: t.truckId, capital: o.plannedCapital[o.swapPeriod] ?? 0, period: o.swapPeriod });
    }
  return out;
}

/** The cheapest swap due in each period (capital > 0; ties to the first truck id), by period. */
export function cheapestSwapByPeriod(swaps: DueSwap[]): Map<number, { truckId: string; capital: number }> {
  const out = new Map<number, { truckId: string; capital: number }>();
  for (const s of swaps) {
    if (!(s.capital > 0)) continue;
    const was = out.get(s.period);
    if (!was || s.capital < was.capital || (s.capital === was.capital && s.truckId < was.truckId)) out.set(s.period, { truckId: s.truckId, capital: s.capital });
  }
  return out;
}

/**
 * How far the form reaches: budget fields for periods 0 … the last period
 * with a swap due, and capacity fields for the months up to a year past that
 * period's end (a swap may be planned up to 12 months late), both within the
 * horizon (`periods`: 0 = now … the longest truck's last year). Past that no
 * option plans a swap, so a figure there would change nothing.
 *
 * @example formExtent([{ truckId: 'T1', capital: 1, period: 3 }], 13) // → { lastPeriod: 3, months: 48 }
 */
export function formExtent(swaps: DueSwap[], periods: number): { lastPeriod: number; months: number } {
  const horizonMonths = Math.min(240, Math.max(1, periods - 1) * 12);
  const last = Math.min(Math.max(1, ...swaps.map((s) => s.period)), Math.max(1, periods - 1));
  return { lastPeriod: last, months: Math.min(horizonMonths, 12 * (last + 1)) };
}

/**
 * The warning under a budget: when it is below the cheapest repower due in
 * its period, no swap due then fits it. Null without a budget, without a swap
 * due, or at or above the cheapest. The cheapest is given in thousands,
 * rounded up to the whole currency unit, so the figure shown is enough.
 */
export function budgetWarning(
  budget: number | null,
  cheapest: { truckId: string; capital: number } | undefined,
  ctx: { periodName: string; currency: string; format: NumberFormat },
): string | null {
  if (budget === null || !cheapest || budget >= cheapest.capital) return null;
  const needs = formatNumberText(storedToBudget(Math.ceil(cheapest.capital)), ctx.format, true);
  return `Below the cheapest repower due in ${ctx.periodName} (${cheapest.truckId}, ${needs} ${ctx.currency} k): no swap due in ${ctx.periodName} fits this budget, so the programme moves them later or leaves them out.`;
}

/** What the form holds: every field as typed. */
export interface PlanFormText {
  /** by period ("0", "1", …), in thousands */
  budgets: Record<string, string>;
  swapsPerMonth: string;
  startMonth: string;
  /** by month index ("0", "1", …); empty = the default (swaps per month) */
  capacity: Record<string, string>;
  maxDelayMonths: string;
}

export interface PlanFormContext {
  format: NumberFormat;
  currency: string;
  /** the period's name for a budget key: "FY2027 (now)", "FY2028" */
  periodName: (period: number) => string;
  /** the month's "YYYY-MM" for a month index */
  monthLabel: (month: number) => string;
  /** overrides stored for months the grid does not show: kept as they are */
  keepOverrides?: Record<string, number>;
}

/** The form's text as it shows the stored settings: budgets in thousands with grouping, only overridden months filled. */
export function planFormText(plan: PlanSettings, format: NumberFormat, gridMonths: number): PlanFormText {
  const budgets = Object.fromEntries(Object.entries(plan.budgets).map(([p, b]) => [p, storedBudgetText(b, format)]));
  const capacity: Record<string, string> = {};
  for (const [m, c] of Object.entries(plan.capacityByMonth ?? {})) if (Number(m) < gridMonths && c !== plan.swapsPerMonth) capacity[m] = String(c);
  return { budgets, swapsPerMonth: String(plan.swapsPerMonth), startMonth: plan.startMonth, capacity, maxDelayMonths: String(plan.maxDelayMonths ?? '') };
}

/** The label of the field a problem's path names ("plan.budgets.1", "capacityByMonth.4", …), or null for none. */
export function planFieldLabel(path: string, ctx: Pick<PlanFormContext, 'currency' | 'periodName' | 'monthLabel'>): string | null {
  const p = path.replace(/^plan\./, '');
  let m = /^budgets\.(\d+)$/.exec(p);
  if (m) return budgetLabel(ctx.periodName(Number(m[1])), ctx.currency);
  m = /^capacityByMonth\.(\d+)$/.exec(p);
  if (m) return capacityLabel(ctx.monthLabel(Number(m[1])));
  if (p === 'swapsPerMonth') return SWAPS_LABEL;
  if (p === 'maxDelayMonths') return MAX_DELAY_LABEL;
  if (p === 'startMonth') return START_LABEL;
  return null;
}

/**
 * Reads the whole form: the settings to save, or every problem (path as the
 * settings schema names it, message starting with the field's label). The
 * result is also checked against the schema the handler uses.
 */
export function readPlanForm(text: PlanFormText, ctx: PlanFormContext): { ok: true; settings: PlanSettings } | { ok: false; problems: Problem[] } {
  const problems: Problem[] = [];
  const budgets: Record<string, number | null> = {};
  for (const [p, t] of Object.entries(text.budgets)) {
    const r = readBudgetText(t, ctx.format, budgetLabel(ctx.periodName(Number(p)), ctx.currency));
    if (!r.ok) problems.push({ path: `budgets.${p}`, message: r.message });
    else if (r.value !== null) budgets[p] = r.value;
  }
  const swaps = readWholeText(text.swapsPerMonth, ctx.format, SWAPS_LABEL, 1, MAX_CAPACITY);
  if (!swaps.ok) problems.push({ path: 'swapsPerMonth', message: swaps.message });
  else if (swaps.value === null) problems.push({ path: 'swapsPerMonth', message: `${SWAPS_LABEL}: enter the shop's usual swaps a month, such as 2` });
  const perMonth = swaps.ok ? swaps.value : null;

  const capacityByMonth: Record<string, number> = {};
  for (const [m, c] of Object.entries(ctx.keepOverrides ?? {})) if (c !== perMonth) capacityByMonth[m] = c;
  for (const [m, t] of Object.entries(text.capacity)) {
    const r = readWholeText(t, ctx.format, capacityLabel(ctx.monthLabel(Number(m))), 0, MAX_CAPACITY);
    if (!r.ok) problems.push({ path: `capacityByMonth.${m}`, message: r.message });
    else if (r.value !== null && r.value !== perMonth) capacityByMonth[m] = r.value;
  }

  const delay = readWholeText(text.maxDelayMonths, ctx.format, MAX_DELAY_LABEL, 0, MAX_DELAY_MONTHS);
  if (!delay.ok) problems.push({ path: 'maxDelayMonths', message: delay.message });
  if (!/^\d{4}-(0[1-9]|1[0-2])$/.test(text.startMonth)) problems.push({ path: 'startMonth', message: `${START_LABEL}: choose a month` });
  if (problems.length) return { ok: false, problems };

  const settings: PlanSettings = {
    budgets,
    swapsPerMonth: perMonth as number,
    startMonth: text.startMonth,
    capacityByMonth,
    ...(delay.ok && delay.value !== null ? { maxDelayMonths: delay.value } : {}),
  };
  const checked = planSettingsSchema.safeParse(settings);
  if (!checked.success) {
    return {
      ok: false,
      problems: checked.error.issues.map((i) => {
        const path = i.path.join('.');
        const label = planFieldLabel(path, ctx);
        return { path, message: label ? `${label}: ${i.message}` : i.message };
      }),
    };
  }
  return { ok: true, settings: checked.data };
}
