/**
 * Issue 20: a controller opens the approved demo case a year and more on and
 * reads, truck by truck, what it promised against the readings since: the
 * truck burning more than forecast is flagged with its variance.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, WS } from './support/browser';

describe('plan against actual', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('a viewer opens the approved case, follows the link to plan against actual and reads the flagged truck', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: 'North Pit 300 t repower programme (approved 2024-11)' }).first().click();
    await page.getByTestId('actuals-link').click();
    await page.getByTestId('actuals-trucks').waitFor();
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('plan against actual');
    // T3-05 burns about 8 % over the case: flagged for burn at the default ± 5 %
    const flagged = page.getByTestId('actuals-truck-T3-05');
    expect(await flagged.getByTestId('flags').textContent()).toContain('burn');
    const burn = (await flagged.getByTestId('burn-variance').textContent()) ?? '';
    const pct = Number(burn.replace('+', '').replace('%', '').trim());
    expect(pct).toBeGreaterThan(7);
    expect(pct).toBeLessThan(9);
    expect(await page.getByTestId('actuals-flag-summary').textContent()).toContain('T3-05');
    // a truck near its forecast is not flagged
    expect(((await page.getByTestId('actuals-truck-T3-04').getByTestId('flags').textContent()) ?? '').trim()).toBe('');
    await page.getByTestId('actuals-chart').waitFor();
    await screenshot(page, 'plan-vs-actual-since-approval');
    // one fiscal year: FY2026 (January start: the calendar year 2026, to 2026-11)
    await page.getByTestId('actuals-year').selectOption('2026');
    expect(await page.getByTestId('actuals-year').locator('option:checked').textContent()).toBe('FY2026 to date');
    expect(await page.getByTestId('actuals-truck-T3-05').getByTestId('flags').textContent()).toContain('burn');
    await screenshot(page, 'plan-vs-actual-fy2026');
  });

  it('a case that is not approved says so plainly', async () => {
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: 'North Pit fleet — base assumptions' }).first().click();
    await page.waitForURL(/\/cases\/\d+$/);
    expect(await page.getByTestId('actuals-link').count()).toBe(0);
    await page.goto(`${page.url()}/actuals`);
    expect(await page.getByTestId('actuals-unavailable').textContent()).toContain('This case is not approved');
  });
});
