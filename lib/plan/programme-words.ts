/**
 * The fleet programme in words (issue 15): the solver's status, why there is
 * no plan, what one more unit of a binding constraint is worth, and why a
 * truck's timing is not its best. Pure: the programme's figures in, sentences
 * out; the plan page shows them as they are (lib/cases/programme-types.ts
 * describes the figures).
 *
 * Money is shown in thousands of the workspace currency ("USD k"): a gain
 * under 10 k keeps one decimal so a small but real gain does not read as 0.
 */
import { formatMoney, formatNumber, type NegativeStyle } from '@/lib/format';

/** What the words read of a programme's answer (a ProgrammeDto fits). */
export interface ProgrammeRun {
  ok: boolean;
  message: string | null;
  status: string;
  /** relative MIP gap: 0 = proven optimal, +∞ = no bound proven */
  gap: number;
  seconds: number;
  trucks: readonly unknown[];
}

export interface BindingConstraint {
  kind: 'budget' | 'capacity';
  index: number;
  /** "FY2028" (budget) or "2029-01" (capacity) */
  label: string;
  limit: number;
  used: number;
  /** money (budget) or swaps (capacity) */
  relaxBy: number;
  /** re-solved optimum less the optimum, money ≥ 0 */
  gain: number;
}

export interface TimingWords {
  label: string;
  delayMonths: number;
  month: number | null;
  monthLabel: string | null;
  capitalPeriod: number | null;
  plannedCapital: number;
}

export interface TruckTiming {
  chosen: TimingWords;
  best: TimingWords;
  cost: number;
  forcedDelay: boolean;
}

/** The shop's months and the budgets' periods of the chosen plan (to say which one moved a truck). */
export interface PlanLoad {
  months: readonly { month: number; label: string; capacity: number; used: number }[];
  periods: readonly { period: number; label: string; budget: number | null; plannedCapital: number }[];
}

const plural = (n: number, one: string, many: string) => `${formatNumber(n, 0)} ${n === 1 ? one : many}`;

/** Thousands of money: one decimal below 10 k (6,680 → "6.7"), whole thousands above (12,345,678 → "12,346"). */
export function moneyK(x: number, negative: NegativeStyle = 'parentheses'): string {
  return formatMoney(x, { scale: 'k', digits: Math.abs(x) < 10_000 ? 1 : 0, negative });
}

/** The relative gap in words: 0 → "0 %", below 0.01 % → "under 0.01 %", +∞ or NaN → "unknown". */
export function gapWords(gap: number): string {
  if (!Number.isFinite(gap)) return 'unknown';
  if (gap <= 0) return '0 %';
  if (gap < 1e-4) return 'under 0.01 %';
  return `${formatNumber(gap * 100, 2)} %`;
}

/** Seconds in words: under 0.1 s → "under 0.1 s", else one decimal ("0.4 s", "12.3 s"). */
export function secondsWords(s: number): string {
  if (!Number.isFinite(s) || s < 0.1) return 'under 0.1 s';
  return `${formatNumber(s, 1)} s`;
}

const STATUS_WORDS: Record<string, string> = {
  infeasible: 'no plan fits',
  'unbounded or infeasible': 'no plan fits',
  'time limit': 'stopped at its time limit without a plan',
  'iteration limit': 'stopped at its iteration limit without a plan',
  interrupted: 'was interrupted before it found a plan',
  'not solved': 'not solved: the inputs cannot make a plan',
};

/**
 * The solver's status, gap and time in one plain sentence. Examples:
 * - optimal, gap 0, 0.36 s → "Optimal: no other timing of the trucks within the budgets and the shop's
 *   capacity gives the fleet a higher expected NPV (the solver proved it: gap 0 %). Solved in 0.4 s,
 *   counting a re-solve for each binding constraint."
 * - time limit with a plan, gap 0.012 → "Stopped at the time limit: the best plan found, at most 1.20 %
 *   below the best possible (gap 1.20 %). Solved in 30.0 s, …"
 * - not ok, status "infeasible" → "No plan: no plan fits (after 0.1 s)."
 */
export function statusSentence(p: ProgrammeRun): string {
  const time = `Solved in ${secondsWords(p.seconds)}, counting a re-solve for each binding constraint.`;
  if (!p.ok) {
    const what = STATUS_WORDS[p.status] ?? `the solver answered "${p.status}"`;
    return p.status === 'not solved' ? `No plan: ${what}.` : `No plan: ${what} (after ${secondsWords(p.seconds)}).`;
  }
  if (p.status === 'optimal') {
    return `Optimal: no other timing of the trucks within the budgets and the shop's capacity gives the fleet a higher expected NPV (the solver proved it: gap ${gapWords(p.gap)}). ${time}`;
  }
  if (p.status === 'time limit') {
    return Number.isFinite(p.gap)
      ? `Stopped at the time limit: the best plan found, at most ${gapWords(p.gap)} below the best possible (gap ${gapWords(p.gap)}). ${time}`
      : `Stopped at the time limit: the best plan found, not proven optimal (gap unknown). ${time}`;
  }
  return `Plan found, solver status "${p.status}" (gap ${gapWords(p.gap)}). ${time}`;
}

/**
 * Why there is no plan, in plain words, or null when there is one: the
 * programme's own message (which names the truck, budget or month), else
 * the status in words.
 */
export function programmeMessage(p: ProgrammeRun): string | null {
  if (p.ok && p.trucks.length > 0) return null;
  if (p.ok) return 'There are no trucks to plan: add trucks to the case first.';
  if (p.message) return p.message;
  return `The solver found no plan (${STATUS_WORDS[p.status] ?? p.status}). Raise a budget, add shop capacity or allow later timings, then plan again.`;
}

/**
 * What one more unit of a binding constraint is worth, as a sentence:
 * - budget +1,000,000, gain 12,345,678 in FY2028 → "Another 1,000 USD k in FY2028 adds 12,346 USD k to the
 *   fleet's expected NPV (its budget of 10,000 USD k is all planned)."
 * - month +1 swap, gain 6,679.7 in 2029-01 → "One more swap in 2029-01 adds 6.7 USD k to the fleet's expected NPV
 *   (the shop is full: 2 of 2 swaps)."
 * - gain 0 → "… adds nothing: no truck's timing would change for it (…)."
 * - a shutdown month (limit 0) → "Opening the shop for one swap in 2027-03 adds … (it is shut that month)."
 */
export function bindingSentence(b: BindingConstraint, currency: string, negative: NegativeStyle = 'parentheses'): string {
  const gain = Number.isFinite(b.gain) && b.gain > 0 ? `adds ${moneyK(b.gain, negative)} ${currency} k to the fleet's expected NPV` : "adds nothing: no truck's timing would change for it";
  if (b.kind === 'budget') {
    const k = (x: number) => formatMoney(x, { scale: 'k', negative });
    return `Another ${k(b.relaxBy)} ${currency} k in ${b.label} ${gain} (its budget of ${k(b.limit)} ${currency} k is all planned).`;
  }
  if (b.limit === 0) {
    return `Opening the shop for ${b.relaxBy === 1 ? 'one swap' : plural(b.relaxBy, 'swap', 'swaps')} in ${b.label} ${gain} (it is shut that month).`;
  }
  const more = b.relaxBy === 1 ? 'One more swap' : `${formatNumber(b.relaxBy, 0)} more swaps`;
  return `${more} in ${b.label} ${gain} (the shop is full: ${formatNumber(b.used, 0)} of ${plural(b.limit, 'swap', 'swaps')}).`;
}

/** An option in a few words: "Repower at the next planned overhaul, 2030-02" or "Rebuild (no swap)". */
export function optionWords(o: Pick<TimingWords, 'label' | 'monthLabel'>): string {
  return o.monthLabel ? `${o.label}, ${o.monthLabel}` : `${o.label} (no swap)`;
}

/** What keeps a truck from its best timing: the shop full in the best option's month, its period's budget, or both together. */
export function whatMovedIt(t: TruckTiming, load: PlanLoad): string {
  const reasons: string[] = [];
  const m = t.best.month === null ? undefined : load.months.find((x) => x.month === t.best.month);
  if (m && m.month !== t.chosen.month && m.used >= m.capacity) reasons.push(m.capacity === 0 ? `the shop is shut in ${m.label}` : `the shop is full in ${m.label}`);
  const p = t.best.capitalPeriod === null ? undefined : load.periods.find((x) => x.period === t.best.capitalPeriod);
  if (p && p.budget !== null) {
    const freed = t.chosen.capitalPeriod === p.period ? t.chosen.plannedCapital : 0;
    if (p.plannedCapital - freed + t.best.plannedCapital > p.budget * (1 + 1e-9)) reasons.push(`the ${p.label} budget has no room for it`);
  }
  return reasons.length ? reasons.join(' and ') : 'the budgets and the shop together';
}

/**
 * A truck's timing against its best, in words (null when it takes its best):
 * - a forced delay → "3 months past its due month: the shop is full in 2029-01. Costs 6.0 USD k of expected NPV
 *   against its best timing (Repower at the next planned overhaul, 2029-01)."
 * - moved without delay → "Not its best timing: the FY2027 budget has no room for it. Costs 155.9 USD k …"
 * - a delay that pays (cost 0) → null: it is the truck's best timing.
 */
export function timingNote(t: TruckTiming, load: PlanLoad, currency: string, negative: NegativeStyle = 'parentheses'): string | null {
  if (!(t.cost > 0)) return null;
  const costs = `Costs ${moneyK(t.cost, negative)} ${currency} k of expected NPV against its best timing (${optionWords(t.best)}).`;
  if (t.forcedDelay) return `${plural(t.chosen.delayMonths, 'month', 'months')} past its due month: ${whatMovedIt(t, load)}. ${costs}`;
  return `Not its best timing: ${whatMovedIt(t, load)}. ${costs}`;
}
