/**
 * Issue 17, entering figures: the plan's budgets are typed in the unit its
 * tables show (USD k) with thousands separators, saved values come back
 * grouped, a budget below the cheapest repower due in its year is flagged,
 * the shop's capacity is set month by month (0 = shutdown) and a wrong
 * figure is refused with a message naming its field, saving nothing.
 * Regression: "10000" typed beside a "USD k" table used to save a 10 k
 * budget, drop every year-1 repower and say "Plan saved."
 */
import type { Knex } from 'knex';
import type { BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createKnex } from '@/lib/db/connection';
import { apiHeaders, openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

type StoredPlan = { budgets: Record<string, number | null>; swapsPerMonth: number; startMonth: string; capacityByMonth?: Record<string, number>; maxDelayMonths?: number };

describe('plan settings in the browser', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let k: Knex;
  let caseId: number;
  let planUrl: string;
  const stored = async () => {
    const row = await k('business_cases').where({ id: caseId }).first('plan', 'version');
    return { plan: JSON.parse(row.plan) as StoredPlan, version: row.version as number };
  };
  const save = async () => {
    await page.getByRole('button', { name: 'Save and plan' }).click();
    await page.getByRole('button', { name: 'Save and plan' }).waitFor(); // "Planning…" while the request runs
  };
  // period 1 of the demo plan (first month 2027-01) is FY2027; period 0 is "FY2027 (now)"
  const budget1 = () => page.getByLabel('FY2027 budget (USD k)', { exact: true });

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await signIn(page, baseURL, 'analyst@aldervane.test');
    // a copy of the demo case (budgets 3 M now, 12 M and 10 M), so other files keep theirs
    const list = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases`)).json();
    const demo = list.cases.find((c: { name: string }) => c.name === 'North Pit fleet — base assumptions');
    const copy = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases/${demo.id}/copy`, { headers: apiHeaders(baseURL), data: { name: 'Plan settings in USD k' } });
    expect(copy.status()).toBe(201);
    caseId = (await copy.json()).case.id;
    planUrl = `${baseURL}/${WS}/cases/${caseId}/plan`;
  });
  afterAll(async () => {
    await k?.destroy();
    await close();
  });

  it('shows the stored budgets in USD k with grouping; "3,000" is saved as 3,000,000 and reads "3,000" after a reload', async () => {
    await page.goto(planUrl);
    await page.getByTestId('programme-periods').waitFor();
    expect(await budget1().inputValue()).toBe('12,000');
    expect(await page.getByLabel('FY2027 (now) budget (USD k)', { exact: true }).inputValue()).toBe('3,000');
    expect(await page.getByLabel('FY2028 budget (USD k)', { exact: true }).inputValue()).toBe('10,000');

    await budget1().fill('3,000');
    await save();
    await page.getByTestId('plan-settings-status').getByText('Plan saved.').waitFor();
    expect(await budget1().inputValue()).toBe('3,000');
    expect((await stored()).plan.budgets).toEqual({ '0': 3_000_000, '1': 3_000_000, '2': 10_000_000 });
    // the programme's table of fiscal years, in USD k, says the same
    await page.getByTestId('programme-periods').locator('tbody tr[data-period="1"] [data-cell="budget"]', { hasText: '3,000' }).waitFor();

    await page.reload();
    await page.getByTestId('programme-periods').waitFor();
    expect(await budget1().inputValue()).toBe('3,000');

    // typed without grouping, shown grouped once saved
    await budget1().fill('4500.5');
    await save();
    await page.getByTestId('plan-settings-status').getByText('Plan saved.').waitFor();
    await expect.poll(() => budget1().inputValue()).toBe('4,500.5');
    expect((await stored()).plan.budgets['1']).toBe(4_500_500);
    await screenshot(page, 'plan-settings-saved');
  });

  it('warns under a budget below the cheapest repower due in its year, before and after saving', async () => {
    await page.goto(planUrl);
    await page.getByTestId('programme-periods').waitFor();
    // the cheapest swap due in period 1: every truck's on-time repower (now or at a planned overhaul) the page was sent
    const result = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/result`)).json();
    const due = (result.dueSwaps as Array<{ truckId: string; capital: number; period: number }>).filter((r) => r.period === 1 && r.capital > 0);
    expect(due.length).toBeGreaterThan(1);
    const cheapest = due.reduce((a, b) => (b.capital < a.capital || (b.capital === a.capital && b.truckId < a.truckId) ? b : a));
    const cheapestK = Math.ceil(cheapest.capital / 1000); // whole k at or above the cheapest swap
    const grouped = (x: number) => x.toLocaleString('en-US');

    const warning = page.getByTestId('budget-warning-1');
    await budget1().fill(grouped(cheapestK));
    expect(await warning.count()).toBe(0);
    await budget1().fill(grouped(cheapestK - 1));
    await warning.waitFor();
    expect(await warning.textContent()).toContain(`Below the cheapest repower due in FY2027 (${cheapest.truckId},`);
    // the mistake: 10 k where 10,000 k was meant
    await budget1().fill('10');
    expect(await warning.textContent()).toContain('no swap due in FY2027 fits this budget');
    await save();
    await page.getByTestId('plan-settings-status').getByText('Plan saved.').waitFor();
    expect((await stored()).plan.budgets['1']).toBe(10_000);
    await page.reload();
    await page.getByTestId('programme-periods').waitFor();
    expect(await budget1().inputValue()).toBe('10');
    await warning.waitFor();
    // and indeed no repower is planned in that year at 10 k
    const after = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/result`)).json();
    expect(after.schedule.filter((s: { capitalYear: number | null }) => s.capitalYear === 1)).toEqual([]);
    await screenshot(page, 'plan-settings-warning');
    // no warning for a year whose budget is empty (no limit)
    await budget1().fill('');
    expect(await warning.count()).toBe(0);
  });

  it('sets a month to 0 for a shutdown: marked at once, saved as the only override, still there after a reload', async () => {
    await page.goto(planUrl);
    await page.getByTestId('programme-periods').waitFor();
    const march = page.getByLabel('Capacity 2027-03', { exact: true });
    const cell = page.getByTestId('capacity-cell-2027-03');
    expect(await cell.getAttribute('data-state')).toBe('default');
    await march.fill('0');
    expect(await cell.getAttribute('data-state')).toBe('shutdown');
    expect(await page.getByTestId('capacity-note-2027-03').textContent()).toBe('shutdown');
    // a month typed equal to the default (2 a month) is no override
    await page.getByLabel('Capacity 2027-04', { exact: true }).fill('2');
    await page.getByTestId('max-delay-months').fill('3');
    await save();
    await page.getByTestId('plan-settings-status').getByText('Plan saved.').waitFor();
    const { plan } = await stored();
    expect(plan.capacityByMonth).toEqual({ '2': 0 });
    expect(plan.maxDelayMonths).toBe(3);
    expect(plan.swapsPerMonth).toBe(2);

    await page.reload();
    await page.getByTestId('programme-periods').waitFor();
    expect(await march.inputValue()).toBe('0');
    expect(await cell.getAttribute('data-state')).toBe('shutdown');
    expect(await page.getByLabel('Capacity 2027-04', { exact: true }).inputValue()).toBe('');
    expect(await page.getByTestId('max-delay-months').inputValue()).toBe('3');
    // the programme plans no swap in the shutdown month
    const months = await page.getByTestId('programme-trucks').locator('tbody tr[data-truck] [data-cell="month"]').allTextContents();
    expect(months.filter((m) => m !== 'no swap').length).toBeGreaterThan(0);
    expect(months).not.toContain('2027-03');
    await screenshot(page, 'plan-settings-shutdown');
  });

  it('refuses "abc" with a message naming the field and saves nothing', async () => {
    await page.goto(planUrl);
    await page.getByTestId('programme-periods').waitFor();
    const before = await stored();
    await budget1().fill('abc');
    await page.getByLabel('Capacity 2027-05', { exact: true }).fill('0'); // would be saved with a good budget
    await save();
    await page.getByTestId('budget-error-1').getByText('FY2027 budget (USD k): enter a number such as 18,950').waitFor();
    expect(await page.getByTestId('plan-settings-status').textContent()).toBe('Nothing saved: one value needs attention.');
    expect(await page.getByText(/expected number|NaN/).count()).toBe(0);
    expect(await stored()).toEqual(before);
    await screenshot(page, 'plan-settings-abc');
  });

  it('shows a problem the server answers (422) under the field it names, with nothing saved', async () => {
    await page.goto(planUrl);
    await page.getByTestId('programme-periods').waitFor();
    const before = await stored();
    // the server's own answer for a budget it refuses (the form checks the same rules first, so the answer is stood in for)
    await page.route(`**/api/workspaces/${WS}/cases/${caseId}`, (route) =>
      route.request().method() === 'PATCH'
        ? route.fulfill({ status: 422, contentType: 'application/json', body: JSON.stringify({ error: 'Some values are not valid.', problems: [{ path: 'plan.budgets.2', message: 'must be at most 1,000,000,000,000' }] }) })
        : route.continue(),
    );
    try {
      await page.getByLabel('FY2028 budget (USD k)', { exact: true }).fill('20,000');
      await save();
      await page.getByTestId('budget-error-2').getByText('FY2028 budget (USD k): must be at most 1,000,000,000,000').waitFor();
      expect(await page.getByTestId('plan-settings-status').textContent()).toBe('Nothing saved: Some values are not valid.');
      expect(await page.getByLabel('FY2028 budget (USD k)', { exact: true }).getAttribute('aria-invalid')).toBe('true');
    } finally {
      await page.unroute(`**/api/workspaces/${WS}/cases/${caseId}`);
    }
    expect(await stored()).toEqual(before);
    await signOut(page);
  });
});
