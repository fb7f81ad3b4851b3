import { describe, expect, it } from 'vitest';
import {
  budgetToStored,
  budgetWarning,
  cheapestSwapByPeriod,
  dueSwapsOf,
  formExtent,
  planFieldLabel,
  planFormText,
  readBudgetText,
  readPlanForm,
  shiftDecimal,
  storedBudgetText,
  storedToBudget,
  type PlanFormContext,
  type PlanFormText,
} from '@/lib/plan/settings-input';

const ctx: PlanFormContext = {
  format: 'point',
  currency: 'USD',
  periodName: (p) => (p === 0 ? 'FY2027 (now)' : `FY${2026 + p}`),
  monthLabel: (m) => `2027-${String(m + 1).padStart(2, '0')}`,
};

const form = (over: Partial<PlanFormText> = {}): PlanFormText => ({
  budgets: {},
  swapsPerMonth: '2',
  startMonth: '2027-01',
  capacity: {},
  maxDelayMonths: '6',
  ...over,
});

describe('budgets are typed in thousands and stored in whole currency', () => {
  it('moves the decimal point instead of multiplying floats', () => {
    // 1.005 * 1000 is 1004.9999999999999 in floating point; the typed digits say 1005
    expect(1.005 * 1000).not.toBe(1005);
    expect(shiftDecimal(1.005, 3)).toBe(1005);
    expect(budgetToStored(3000)).toBe(3_000_000);
    expect(budgetToStored(1234.5678)).toBe(1_234_567.8);
    expect(budgetToStored(0.0001)).toBe(0.1);
    expect(budgetToStored(0)).toBe(0);
    expect(storedToBudget(3_000_000)).toBe(3000);
    expect(storedToBudget(12_345)).toBe(12.345);
    expect(storedToBudget(5)).toBe(0.005);
    expect(shiftDecimal(-2.5, 3)).toBe(-2500);
  });

  it('reads "3,000" as 3,000 k (3,000,000 stored) and shows a stored budget grouped', () => {
    expect(readBudgetText('3,000', 'point', 'FY2027 budget (USD k)')).toEqual({ ok: true, value: 3_000_000 });
    expect(readBudgetText('3.000,5', 'comma', 'FY2027 budget (USD k)')).toEqual({ ok: true, value: 3_000_500 });
    expect(readBudgetText('10 000', 'point', 'FY2027 budget (USD k)')).toEqual({ ok: true, value: 10_000_000 });
    expect(readBudgetText('  ', 'point', 'FY2027 budget (USD k)')).toEqual({ ok: true, value: null });
    expect(storedBudgetText(3_000_000, 'point')).toBe('3,000');
    expect(storedBudgetText(12_000_000, 'comma')).toBe('12.000');
    expect(storedBudgetText(1_234_567.8, 'point')).toBe('1,234.5678');
    expect(storedBudgetText(null, 'point')).toBe('');
  });

  it('names the field in a plain message for text that is not a number, a negative or too large a budget', () => {
    expect(readBudgetText('abc', 'point', 'FY2027 budget (USD k)')).toEqual({ ok: false, message: 'FY2027 budget (USD k): enter a number such as 18,950' });
    expect(readBudgetText('-5', 'point', 'FY2028 budget (USD k)')).toEqual({ ok: false, message: 'FY2028 budget (USD k): enter a number from 0 to 1,000,000,000' });
    expect(readBudgetText('2,000,000,000', 'point', 'FY2028 budget (USD k)')).toEqual({ ok: false, message: 'FY2028 budget (USD k): enter a number from 0 to 1,000,000,000' });
    expect(readBudgetText('1e4', 'point', 'FY2028 budget (USD k)')).toEqual({ ok: false, message: 'FY2028 budget (USD k): write the number in full, without an exponent (e)' });
  });
});

describe('the warning under a budget below the cheapest repower due in its year', () => {
  const due = [
    { truckId: 'T3-01', capital: 1_900_000.4, period: 1 },
    { truckId: 'T3-02', capital: 2_400_000, period: 1 },
    { truckId: 'T3-03', capital: 2_100_000, period: 2 },
    { truckId: 'T3-05', capital: 0, period: 3 },
  ];
  const cheapest = cheapestSwapByPeriod(due);

  it('finds the cheapest swap with capital in each period', () => {
    expect([...cheapest.entries()]).toEqual([
      [1, { truckId: 'T3-01', capital: 1_900_000.4 }],
      [2, { truckId: 'T3-03', capital: 2_100_000 }],
    ]);
  });

  it('counts only on-time swaps: repower now or at a planned overhaul, not keep, rebuild or a delayed swap', () => {
    const options = (o: Array<[string, number, number | null, number[]]>) => o.map(([kind, delayMonths, swapPeriod, plannedCapital]) => ({ kind, delayMonths, swapPeriod, plannedCapital }));
    const swaps = dueSwapsOf([
      {
        truckId: 'T2-05',
        options: options([
          ['keep', 0, null, []],
          ['rebuild', 0, null, []],
          ['now', 0, 0, [1_890_000]],
          ['event', 0, 1, [0, 1_890_000]],
          ['event', 3, 2, [0, 0, 1_937_250]],
        ]),
      },
      { truckId: 'T3-04', options: options([['event', 0, 3, [0, 0, 0, 0]]]) },
    ]);
    expect(swaps).toEqual([
      { truckId: 'T2-05', capital: 1_890_000, period: 0 },
      { truckId: 'T2-05', capital: 1_890_000, period: 1 },
      { truckId: 'T3-04', capital: 0, period: 3 },
    ]);
    // a swap with no planned capital in its period sets no floor for its budget
    expect(cheapestSwapByPeriod(swaps).get(3)).toBeUndefined();
  });

  it('warns below the cheapest, not at or above it, not without a budget or a swap due', () => {
    const c = { periodName: 'FY2027', currency: 'USD', format: 'point' as const };
    // 10,000 typed as if in dollars is 10 k: below every swap of the year
    expect(budgetWarning(10_000, cheapest.get(1), c)).toBe(
      'Below the cheapest repower due in FY2027 (T3-01, 1,900.001 USD k): no swap due in FY2027 fits this budget, so the programme moves them later or leaves them out.',
    );
    expect(budgetWarning(1_900_000, cheapest.get(1), c)).not.toBeNull();
    expect(budgetWarning(1_900_000.4, cheapest.get(1), c)).toBeNull();
    expect(budgetWarning(3_000_000, cheapest.get(1), c)).toBeNull();
    expect(budgetWarning(null, cheapest.get(1), c)).toBeNull();
    expect(budgetWarning(0, cheapest.get(3), c)).toBeNull();
  });
});

describe('how far the form reaches', () => {
  it('asks for budgets up to the last period with a swap due and capacity up to a year past it, within the horizon', () => {
    const swap = (period: number) => ({ truckId: 'T1', capital: 1, period });
    expect(formExtent([swap(1), swap(3)], 13)).toEqual({ lastPeriod: 3, months: 48 });
    // the horizon ends first: months 0 … 12·(periods − 1) − 1
    expect(formExtent([swap(6)], 7)).toEqual({ lastPeriod: 6, months: 72 });
    // no swap due: the first year still has its fields
    expect(formExtent([], 5)).toEqual({ lastPeriod: 1, months: 24 });
    expect(formExtent([swap(0)], 1)).toEqual({ lastPeriod: 1, months: 12 });
  });
});

describe('reading the whole form', () => {
  it('saves budgets in the stored unit and only the months that differ from the default capacity', () => {
    const r = readPlanForm(form({ budgets: { '0': '', '1': '3,000', '2': '12,500.5' }, capacity: { '0': '', '1': '2', '2': '0', '3': '4' } }), ctx);
    expect(r).toEqual({
      ok: true,
      settings: { budgets: { '1': 3_000_000, '2': 12_500_500 }, swapsPerMonth: 2, startMonth: '2027-01', capacityByMonth: { '2': 0, '3': 4 }, maxDelayMonths: 6 },
    });
  });

  it('keeps stored overrides of months outside the grid unless they now equal the default', () => {
    const r = readPlanForm(form({ swapsPerMonth: '3' }), { ...ctx, keepOverrides: { '150': 0, '151': 3 } });
    expect(r.ok && r.settings.capacityByMonth).toEqual({ '150': 0 });
  });

  it('lists every problem with its path and the field named, and saves nothing', () => {
    const r = readPlanForm(form({ budgets: { '1': 'abc', '2': '5' }, swapsPerMonth: '0', capacity: { '4': '1.5', '5': 'x' }, maxDelayMonths: '13', startMonth: '' }), ctx);
    expect(r).toEqual({
      ok: false,
      problems: [
        { path: 'budgets.1', message: 'FY2027 budget (USD k): enter a number such as 18,950' },
        { path: 'swapsPerMonth', message: 'Swaps per month: enter a number from 1 to 100' },
        { path: 'capacityByMonth.4', message: 'Capacity 2027-05: enter a whole number' },
        { path: 'capacityByMonth.5', message: 'Capacity 2027-06: enter a number such as 2' },
        { path: 'maxDelayMonths', message: 'Most months a swap may be planned late: enter a number from 0 to 12' },
        { path: 'startMonth', message: 'First month of the plan: choose a month' },
      ],
    });
  });

  it('asks for the usual swaps a month when the field is empty', () => {
    const r = readPlanForm(form({ swapsPerMonth: ' ' }), ctx);
    expect(r).toEqual({ ok: false, problems: [{ path: 'swapsPerMonth', message: "Swaps per month: enter the shop's usual swaps a month, such as 2" }] });
  });

  it('shows the stored settings as text: budgets in thousands, overridden months only', () => {
    const text = planFormText(
      { budgets: { '0': 3_000_000, '1': null, '2': 10_000_000 }, swapsPerMonth: 2, startMonth: '2027-01', capacityByMonth: { '3': 0, '200': 1 }, maxDelayMonths: 4 },
      'point',
      120,
    );
    expect(text).toEqual({ budgets: { '0': '3,000', '1': '', '2': '10,000' }, swapsPerMonth: '2', startMonth: '2027-01', capacity: { '3': '0' }, maxDelayMonths: '4' });
    // what is shown reads back to what is stored
    const back = readPlanForm(text, { ...ctx, keepOverrides: { '200': 1 } });
    expect(back).toEqual({ ok: true, settings: { budgets: { '0': 3_000_000, '2': 10_000_000 }, swapsPerMonth: 2, startMonth: '2027-01', capacityByMonth: { '3': 0, '200': 1 }, maxDelayMonths: 4 } });
  });

  it('names the field of a server problem by its path', () => {
    expect(planFieldLabel('plan.budgets.2', ctx)).toBe('FY2028 budget (USD k)');
    expect(planFieldLabel('plan.capacityByMonth.11', ctx)).toBe('Capacity 2027-12');
    expect(planFieldLabel('plan.maxDelayMonths', ctx)).toBe('Most months a swap may be planned late');
    expect(planFieldLabel('version', ctx)).toBeNull();
  });
});
