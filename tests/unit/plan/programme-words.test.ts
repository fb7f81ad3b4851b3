import { describe, expect, it } from 'vitest';
import {
  bindingSentence,
  gapWords,
  moneyK,
  optionWords,
  programmeMessage,
  secondsWords,
  statusSentence,
  timingNote,
  whatMovedIt,
  type PlanLoad,
  type TimingWords,
} from '@/lib/plan/programme-words';

const run = (over: Partial<Parameters<typeof statusSentence>[0]> = {}) => ({ ok: true, message: null, status: 'optimal', gap: 0, seconds: 0.36, trucks: [1, 2], ...over });

describe('the solver status in words', () => {
  it('an optimal plan says it is proven, with its gap and time', () => {
    expect(statusSentence(run())).toBe(
      "Optimal: no other timing of the trucks within the budgets and the shop's capacity gives the fleet a higher expected NPV (the solver proved it: gap 0 %). Solved in 0.4 s, counting a re-solve for each binding constraint.",
    );
  });
  it('a plan stopped at the time limit says how far from the best it may be', () => {
    expect(statusSentence(run({ status: 'time limit', gap: 0.012, seconds: 30.04 }))).toBe(
      'Stopped at the time limit: the best plan found, at most 1.20 % below the best possible (gap 1.20 %). Solved in 30.0 s, counting a re-solve for each binding constraint.',
    );
    expect(statusSentence(run({ status: 'time limit', gap: Number.POSITIVE_INFINITY }))).toMatch(/^Stopped at the time limit: the best plan found, not proven optimal \(gap unknown\)\./);
  });
  it('no plan: infeasible and unsolved inputs are said plainly', () => {
    expect(statusSentence(run({ ok: false, status: 'infeasible', gap: Number.NaN, seconds: 0.02 }))).toBe('No plan: no plan fits (after under 0.1 s).');
    expect(statusSentence(run({ ok: false, status: 'not solved', gap: Number.NaN, seconds: 0 }))).toBe('No plan: not solved: the inputs cannot make a plan.');
    expect(statusSentence(run({ ok: false, status: 'load error', seconds: 1.25 }))).toBe('No plan: the solver answered "load error" (after 1.3 s).');
  });
  it('gaps and times', () => {
    expect(gapWords(0)).toBe('0 %');
    expect(gapWords(5e-7)).toBe('under 0.01 %');
    expect(gapWords(0.0345)).toBe('3.45 %');
    expect(gapWords(Number.NaN)).toBe('unknown');
    expect(secondsWords(0.04)).toBe('under 0.1 s');
    expect(secondsWords(1.96)).toBe('2.0 s');
  });
});

describe('why there is no plan', () => {
  it('a plan with trucks needs no message', () => {
    expect(programmeMessage(run())).toBeNull();
  });
  it('the programme\'s own reason is shown as it is (it names the truck, budget or month)', () => {
    const message = 'No plan fits: truck 3 (T3-03) has no option that fits on its own — each needs a month the shop is closed or more capital than a year\'s budget.';
    expect(programmeMessage(run({ ok: false, status: 'infeasible', message }))).toBe(message);
  });
  it('without a reason, the status in words and what to change', () => {
    expect(programmeMessage(run({ ok: false, status: 'time limit', message: null }))).toBe(
      'The solver found no plan (stopped at its time limit without a plan). Raise a budget, add shop capacity or allow later timings, then plan again.',
    );
  });
  it('an empty fleet says to add trucks', () => {
    expect(programmeMessage(run({ trucks: [] }))).toBe('There are no trucks to plan: add trucks to the case first.');
  });
});

describe('what one more unit of a binding constraint is worth', () => {
  it('a budget: another 1,000 k in its fiscal year', () => {
    expect(bindingSentence({ kind: 'budget', index: 2, label: 'FY2028', limit: 10_000_000, used: 9_999_999.9, relaxBy: 1_000_000, gain: 12_345_678 }, 'USD')).toBe(
      "Another 1,000 USD k in FY2028 adds 12,346 USD k to the fleet's expected NPV (its budget of 10,000 USD k is all planned).",
    );
  });
  it('a shop month: one more swap, a small gain keeps a decimal', () => {
    expect(bindingSentence({ kind: 'capacity', index: 24, label: '2029-01', limit: 2, used: 2, relaxBy: 1, gain: 6679.686924 }, 'USD')).toBe(
      "One more swap in 2029-01 adds 6.7 USD k to the fleet's expected NPV (the shop is full: 2 of 2 swaps).",
    );
  });
  it('a full month worth nothing more says so', () => {
    expect(bindingSentence({ kind: 'capacity', index: 0, label: '2027-01', limit: 1, used: 1, relaxBy: 1, gain: 0 }, 'EUR')).toBe(
      "One more swap in 2027-01 adds nothing: no truck's timing would change for it (the shop is full: 1 of 1 swap).",
    );
  });
  it('a shutdown month: opening it for one swap', () => {
    expect(bindingSentence({ kind: 'capacity', index: 3, label: '2027-04', limit: 0, used: 0, relaxBy: 1, gain: 250_400 }, 'USD')).toBe(
      "Opening the shop for one swap in 2027-04 adds 250 USD k to the fleet's expected NPV (it is shut that month).",
    );
  });
  it('thousands: one decimal under 10 k, the workspace\'s negative style', () => {
    expect(moneyK(9_949)).toBe('9.9');
    expect(moneyK(10_000)).toBe('10');
    expect(moneyK(-2_500)).toBe('(2.5)');
    expect(moneyK(-2_500, 'minus')).toBe('−2.5');
  });
});

describe('a truck\'s timing against its best', () => {
  const option = (o: Partial<TimingWords>): TimingWords => ({ label: 'Repower at the next planned overhaul', delayMonths: 0, month: 24, monthLabel: '2029-01', capitalPeriod: 3, plannedCapital: 2_000_000, ...o });
  const load: PlanLoad = {
    months: [
      { month: 24, label: '2029-01', capacity: 2, used: 2 },
      { month: 27, label: '2029-04', capacity: 2, used: 1 },
      { month: 5, label: '2027-06', capacity: 0, used: 0 },
    ],
    periods: [
      { period: 1, label: 'FY2027', budget: 3_000_000, plannedCapital: 2_500_000 },
      { period: 3, label: 'FY2029', budget: null, plannedCapital: 9_000_000 },
    ],
  };
  it('a delay the shop forces: how many months, why and what it costs', () => {
    const t = { chosen: option({ label: 'Repower at the next planned overhaul, 3 months late', delayMonths: 3, month: 27, monthLabel: '2029-04' }), best: option({}), cost: 6_048.2, forcedDelay: true };
    expect(timingNote(t, load, 'USD')).toBe(
      '3 months past its due month: the shop is full in 2029-01. Costs 6.0 USD k of expected NPV against its best timing (Repower at the next planned overhaul, 2029-01).',
    );
  });
  it('a truck the budget keeps from its best timing', () => {
    const t = { chosen: option({ label: 'Keep', month: null, monthLabel: null, capitalPeriod: null, plannedCapital: 0 }), best: option({ label: 'Repower now', month: 0, monthLabel: '2027-01', capitalPeriod: 1, plannedCapital: 1_890_000 }), cost: 155_868, forcedDelay: false };
    expect(whatMovedIt(t, load)).toBe('the FY2027 budget has no room for it');
    expect(timingNote(t, load, 'USD')).toBe('Not its best timing: the FY2027 budget has no room for it. Costs 156 USD k of expected NPV against its best timing (Repower now, 2027-01).');
  });
  it('a shut month is named as shut; a best option whose month and budget both have room reads as both together', () => {
    const shut = { chosen: option({ delayMonths: 1, month: 6 }), best: option({ month: 5, monthLabel: '2027-06', capitalPeriod: null }), cost: 1, forcedDelay: true };
    expect(whatMovedIt(shut, load)).toBe('the shop is shut in 2027-06');
    const both = { chosen: option({ delayMonths: 1, month: 28 }), best: option({ month: 27, monthLabel: '2029-04' }), cost: 1, forcedDelay: true };
    expect(whatMovedIt(both, load)).toBe('the budgets and the shop together');
  });
  it('a truck on its best timing, or a delay that pays, has no note', () => {
    expect(timingNote({ chosen: option({ delayMonths: 2 }), best: option({ delayMonths: 2 }), cost: 0, forcedDelay: false }, load, 'USD')).toBeNull();
  });
  it('options in a few words', () => {
    expect(optionWords({ label: 'Rebuild', monthLabel: null })).toBe('Rebuild (no swap)');
    expect(optionWords({ label: 'Repower now', monthLabel: '2027-01' })).toBe('Repower now, 2027-01');
  });
});
