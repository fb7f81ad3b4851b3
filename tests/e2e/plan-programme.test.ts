/**
 * Issue 15: the plan page shows the fleet programme. An analyst opens the demo case's plan, reads the solver's
 * status, a truck's chosen timing and its alternatives, the delays the budgets or the shop force, what one more
 * swap in a full month adds, and the fleet chart with its table — every figure the programme route's own.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import type { ProgrammeDto } from '@/lib/cases/programme-types';
import { openBrowser, screenshot, signIn, WS } from './support/browser';

/** "(14,189)" → −14189, "6.7" → 6.7; "no limit" → null. */
const num = (s: string | null): number | null => {
  const t = (s ?? '').trim();
  if (t === '' || t === 'no limit' || t.startsWith('—')) return null;
  const neg = /^\(.*\)$/.test(t) || t.startsWith('−');
  const v = Number(t.replace(/[()−,\s]/g, ''));
  return neg ? -v : v;
};
/** Money in thousands as the page rounds it (whole thousands); +0 turns −0 into 0. */
const wholeK = (x: number) => Number((x / 1000).toFixed(0)) + 0;
/** The first figure after `after` in a sentence ("adds 6.7 USD k" → 6.7). */
const figureAfter = (text: string, after: string) => num(new RegExp(`${after} ([(−]?[\\d,.]+\\)?)`).exec(text)?.[1] ?? '');

describe('the fleet programme on the plan page', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('an analyst reads the status, a truck\'s timing and alternatives, the forced delays, a binding month and the fleet chart, as the API answers', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: 'North Pit fleet — base assumptions' }).first().click();
    await page.getByRole('navigation', { name: 'Case' }).getByRole('link', { name: 'Fleet programme and ranking' }).click();
    await page.waitForURL(/\/cases\/\d+\/plan$/);
    const caseId = /\/cases\/(\d+)\/plan$/.exec(page.url())![1];
    expect(await page.getByRole('link', { name: 'Fleet programme and ranking' }).getAttribute('aria-current')).toBe('page');
    const answer = await page.request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/programme`);
    expect(answer.status()).toBe(200);
    const api = (await answer.json()) as ProgrammeDto;
    expect(api.ok).toBe(true);
    expect(api.status).toBe('optimal');

    // the status in plain words: proven optimal, its gap and the time the solve took
    const status = page.getByTestId('programme-status');
    await status.waitFor();
    const statusText = (await status.textContent()) ?? '';
    expect(statusText).toMatch(/^Optimal: no other timing of the trucks within the budgets and the shop's capacity gives the fleet a higher expected NPV \(the solver proved it: gap 0 %\)\./);
    expect(statusText).toContain(api.seconds < 0.1 ? 'Solved in under 0.1 s' : `Solved in ${api.seconds.toFixed(1)} s`);
    expect(await page.getByTestId('programme-message').count()).toBe(0);

    // one row per truck; the first truck the programme swaps: its chosen timing, month and expected NPV
    const table = page.getByTestId('programme-trucks');
    expect(await table.locator('tbody tr[data-truck]').count()).toBe(api.trucks.length);
    const swap = api.trucks.find((t) => t.chosen.month !== null)!;
    expect(swap).toBeDefined();
    const row = table.locator(`tr[data-truck="${swap.truckId}"]`);
    expect(await row.locator('[data-cell="chosen"]').textContent()).toBe(swap.chosen.label);
    expect(await row.locator('[data-cell="month"]').textContent()).toBe(swap.chosen.monthLabel);
    expect(num(await row.locator('[data-cell="npv"]').textContent())).toBe(wholeK(swap.chosen.npv));

    // its alternatives open beneath it, best first, each with its expected NPV
    await row.getByRole('button', { name: `Show ${swap.alternatives.length} alternatives of ${swap.truckId}` }).click();
    const alternatives = page.getByTestId(`alternatives-${swap.truckId}`);
    await alternatives.waitFor();
    const options = alternatives.locator('tbody tr');
    expect(await options.count()).toBe(swap.alternatives.length);
    expect(await options.first().getAttribute('data-option')).toBe(swap.alternatives[0].key);
    expect(num(await options.first().locator('[data-cell="npv"]').textContent())).toBe(wholeK(swap.alternatives[0].npv));
    expect(num(await options.last().locator('[data-cell="npv"]').textContent())).toBe(wholeK(swap.alternatives[swap.alternatives.length - 1].npv));
    await screenshot(page, 'plan-programme-alternatives');
    await row.getByRole('button', { name: `Hide ${swap.alternatives.length} alternatives of ${swap.truckId}` }).click();
    expect(await page.getByTestId(`alternatives-${swap.truckId}`).count()).toBe(0);

    // the delays the budgets or the shop force are marked, each with what it costs
    const forced = api.trucks.filter((t) => t.forcedDelay);
    expect(forced.length).toBeGreaterThan(0);
    expect(await table.locator('tr[data-forced="yes"]').count()).toBe(forced.length);
    for (const t of forced) {
      const note = (await page.getByTestId(`moved-${t.truckId}`).textContent()) ?? '';
      expect(note).toMatch(new RegExp(`^${t.chosen.delayMonths} months? past its due month: .+\\. Costs [\\d.,]+ ${api.currency} k of expected NPV against its best timing`));
      // one decimal under 10 k, whole thousands above
      expect(Math.abs(figureAfter(note, 'Costs')! - t.cost / 1000)).toBeLessThanOrEqual(t.cost < 10_000 ? 0.05 : 0.5);
      expect(num(await table.locator(`tr[data-truck="${t.truckId}"] [data-cell="cost"]`).textContent())).toBeGreaterThan(0);
    }

    // what each binding constraint costs: one item per full month or spent budget, with the re-solved gain
    const binding = page.getByTestId('programme-binding').locator('li');
    expect(api.binding.length).toBeGreaterThan(0);
    expect(await binding.count()).toBe(api.binding.length);
    const paying = api.binding.find((b) => b.gain > 0)!;
    expect(paying).toBeDefined();
    const item = page.getByTestId('programme-binding').locator(`li[data-kind="${paying.kind}"][data-index="${paying.index}"]`);
    const sentence = (await item.textContent()) ?? '';
    expect(sentence).toMatch(paying.kind === 'capacity' ? new RegExp(`^One more swap in ${paying.label} adds [\\d.,]+ ${api.currency} k to the fleet's expected NPV`) : new RegExp(`^Another 1,000 ${api.currency} k in ${paying.label.replace(/[()]/g, '\\$&')} adds`));
    expect(Math.abs(figureAfter(sentence, 'adds')! - paying.gain / 1000)).toBeLessThanOrEqual(paying.gain < 10_000 ? 0.05 : 0.5);

    // the shop by month: the months with a swap planned (or a capacity of their own), full ones said so
    const shopMonths = api.months.filter((m) => m.used > 0 || m.capacity !== api.settings.swapsPerMonth);
    expect(await page.getByTestId('programme-months').locator('tbody tr').count()).toBe(shopMonths.length);
    const fullMonth = api.binding.find((b) => b.kind === 'capacity')!;
    expect(fullMonth).toBeDefined();
    const full = page.getByTestId('programme-months').locator(`tr[data-month="${fullMonth.label}"]`);
    expect(num(await full.locator('[data-cell="used"]').textContent())).toBe(fullMonth.used);
    expect(num(await full.locator('[data-cell="capacity"]').textContent())).toBe(fullMonth.limit);
    expect(await full.locator('[data-cell="note"]').textContent()).toBe('full');

    // the fleet chart and its table: planned capital and expected cash flow by fiscal year, the API's figures
    const chart = page.getByTestId('programme-chart');
    await chart.scrollIntoViewIfNeeded();
    // drawn once the chart has measured its width: one bar per period, heights in proportion to planned capital
    await chart.locator('rect.visx-bar').first().waitFor();
    expect(await chart.locator('svg text').allTextContents()).toContain('Fiscal year of spend');
    const heights = await chart.locator('rect.visx-bar').evaluateAll((rects) => rects.map((r) => Number(r.getAttribute('height'))));
    expect(heights).toHaveLength(api.periods.length);
    const most = Math.max(...api.periods.map((p) => p.plannedCapital));
    const tallest = Math.max(...heights);
    api.periods.forEach((p, i) => expect(Math.abs(heights[i] / tallest - p.plannedCapital / most)).toBeLessThan(0.01));
    const periods = page.getByTestId('programme-periods').locator('tbody tr');
    expect(await periods.count()).toBe(api.periods.length);
    for (const p of api.periods) {
      const r = page.getByTestId('programme-periods').locator(`tr[data-period="${p.period}"]`);
      expect(await r.locator('td').first().textContent()).toBe(p.label);
      expect(num(await r.locator('[data-cell="budget"]').textContent())).toBe(p.budget === null ? null : wholeK(p.budget));
      expect(num(await r.locator('[data-cell="planned-capital"]').textContent())).toBe(wholeK(p.plannedCapital));
      expect(num(await r.locator('[data-cell="expected-capital"]').textContent())).toBe(wholeK(p.expectedCapital));
      expect(num(await r.locator('[data-cell="expected-cash-flow"]').textContent())).toBe(wholeK(p.expectedCashFlow));
    }

    // the ranking stays, below the programme
    const programmeBox = (await page.getByTestId('programme').boundingBox())!;
    const rankingBox = (await page.getByTestId('ranking-table').boundingBox())!;
    expect(rankingBox.y).toBeGreaterThan(programmeBox.y + programmeBox.height - 1);
    await page.getByTestId('programme-binding').scrollIntoViewIfNeeded();
    await screenshot(page, 'plan-programme');
  });
});
