/**
 * Realistic sensitivity ranges in the browser, as an analyst reads them: the
 * tornado opens on each driver's realistic range (BSFC −3/+5 % of its value,
 * lib/engine/sensitivity/ranges.ts, "from memory": large high-speed diesels
 * quote about 195–215 g/kWh at rated load), the page's choice switches to
 * ±20 % on every driver (and the address keeps it), and the discount rate's
 * break-even reads in percentage points.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createKnex } from '../../lib/db/connection';
import { insertDemoCase } from '../support/demo-case';
import { openBrowser, screenshot, signIn, WS } from './support/browser';

describe('realistic sensitivity ranges on the demo case', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;

  beforeAll(async () => {
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir') });
    caseId = await insertDemoCase(k, WS, 'Ranges check');
    await k.destroy();
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  const num = (s: string | null) => Number((s ?? '').replace(/,/g, '').replace('−', '-'));
  /** The first BSFC row's base, low and high as the page shows them. */
  async function bsfc() {
    const row = page.getByTestId('tornado-table').locator('tr[data-driver^="bsfcGPerKwh@"]').first();
    await row.waitFor({ timeout: 120_000 });
    const base = num(await row.locator('td').nth(1).textContent());
    const low = num(await row.locator('td').nth(2).locator('input').inputValue());
    const high = num(await row.locator('td').nth(3).locator('input').inputValue());
    return { base, low, high };
  }

  it('opens the tornado on realistic ranges, switches to ±20 %, and reads the discount rate break-even in points', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    await page.getByRole('navigation', { name: 'Case' }).getByRole('link', { name: 'Sensitivity and risk' }).click();
    await page.waitForURL(`${baseURL}/${WS}/cases/${caseId}/risk`);
    expect(await page.getByLabel('Realistic ranges').isChecked()).toBe(true);

    const real = await bsfc();
    expect(real.base).toBeGreaterThan(150);
    // the documented realistic range: −3 % to +5 % of the engine's BSFC (the base is shown to 0.1 g/kWh)
    expect(real.low / real.base).toBeCloseTo(0.97, 3);
    expect(real.high / real.base).toBeCloseTo(1.05, 3);
    expect(await page.getByTestId('tornado-range-note').textContent()).toMatch(/realistic range/);
    await screenshot(page, 'sensitivity-ranges-realistic');

    await page.getByLabel('±20 % on every driver').check();
    await page.waitForURL(/ranges=uniform/);
    await page.waitForFunction((old) => {
      const input = document.querySelector<HTMLInputElement>('[data-testid="tornado-table"] tr[data-driver^="bsfcGPerKwh@"] td:nth-child(3) input');
      return input !== null && Number(input.value) !== old;
    }, real.low, { timeout: 180_000 });
    const uniform = await bsfc();
    expect(uniform.low / uniform.base).toBeCloseTo(0.8, 3);
    expect(uniform.high / uniform.base).toBeCloseTo(1.2, 3);
    expect(await page.getByTestId('tornado-range-note').textContent()).toMatch(/±20 %/);

    // the choice survives a reload (it is in the address)
    await page.reload();
    await page.getByTestId('tornado-table').locator('tr[data-driver^="bsfcGPerKwh@"]').first().waitFor({ timeout: 120_000 });
    expect(await page.getByLabel('±20 % on every driver').isChecked()).toBe(true);

    // repowering every truck against rebuilding crosses zero within the default search of the discount rate (8 % −20/+30 points)
    await page.getByLabel('Measure').selectOption('fleet-delta');
    const be = page.getByTestId('break-even-table').locator('tr[data-driver="discountRate"]');
    await be.waitFor({ timeout: 240_000 });
    const cells = be.locator('td');
    const atBreakEven = (await cells.nth(3).textContent()) ?? '';
    const change = (await cells.nth(4).textContent()) ?? '';
    expect(atBreakEven).toMatch(/^\d+\.\d\d %$/);
    expect(change).toMatch(/^[+−]\d+\.\d pp$/);
    // the points are the break-even rate less the rate in the case, both as the page shows them
    const inCase = num((await cells.nth(2).textContent())!.replace(' %', ''));
    const points = num(change.replace(' pp', '').replace('+', ''));
    expect(points).toBeCloseTo(num(atBreakEven.replace(' %', '')) - inCase, 0);
    await screenshot(page, 'sensitivity-ranges-break-even-pp');
  }, 600_000);
});
