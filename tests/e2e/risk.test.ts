/**
 * Sensitivity and risk in the browser, as an analyst would: open the demo
 * case's risk page, read the tornado and change a driver's range, read the
 * break-even list, run a Monte Carlo and watch it finish into a histogram,
 * then start a long run and cancel it; a viewer sees the result but no run button.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createKnex } from '../../lib/db/connection';
import { insertDemoCase } from '../support/demo-case';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('sensitivity and risk of the demo case', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;

  beforeAll(async () => {
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir') });
    caseId = await insertDemoCase(k, WS);
    await k.destroy();
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  const status = () => page.getByTestId('mc-status');
  const progress = () => page.getByRole('progressbar', { name: 'Monte Carlo progress' });

  it('shows the tornado, redraws it when a driver range changes, and lists break-even values', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    await page.getByRole('navigation', { name: 'Case' }).getByRole('link', { name: 'Sensitivity and risk' }).click();
    await page.waitForURL(`${baseURL}/${WS}/cases/${caseId}/risk`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('Sensitivity and risk');
    const fuelRow = page.getByTestId('tornado-table').locator('tr[data-driver="fuelPrice"]');
    await fuelRow.waitFor();
    const before = await fuelRow.locator('td').nth(5).textContent();
    await page.getByLabel('High value of Fuel price').fill('2.1');
    await page.getByLabel('High value of Fuel price').press('Enter');
    // the redraw may wait on the server behind the fleet break-even, which the first tornado set going
    await page.waitForFunction((old) => document.querySelector('[data-testid="tornado-table"] tr[data-driver="fuelPrice"] td:nth-child(6)')?.textContent !== old, before, { timeout: 180_000 });
    expect(await fuelRow.locator('td').nth(5).textContent()).not.toBe(before);
    expect(await page.getByTestId('tornado-chart').locator('svg[role="img"]').count()).toBe(1);
    expect(await page.getByTestId('tornado-chart').textContent()).toMatch(/ΔNPV of the proposal against rebuilding every engine \(USD M\)/);

    const be = page.getByTestId('break-even-table');
    // a fleet break-even is some hundreds of engine runs, asked for once the tornado is in: slow on a busy machine
    await be.locator('tr[data-driver="modulePrice@kestrel-km2700"]').waitFor({ timeout: 180_000 });
    expect(await be.locator('tr[data-driver="modulePrice@kestrel-km2700"]').textContent()).toMatch(/stops paying above this value/);
    expect(await be.textContent()).toMatch(/None within the range: the proposal pays throughout/);
    await page.getByTestId('spider-chart').waitFor();
    await page.getByTestId('two-way-table').waitFor();
    await screenshot(page, 'risk-tornado-break-even');
  }, 300_000);

  it('runs a Monte Carlo, shows its progress and ends in a histogram with P10, P50 and P90', async () => {
    await page.getByLabel('Iterations', { exact: true }).fill('2000');
    await page.getByLabel('Seed', { exact: true }).fill('7');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await progress().waitFor();
    expect(await status().textContent()).toMatch(/of 2,000 iterations/);
    await page.waitForFunction(() => /finished/.test(document.querySelector('[data-testid="mc-status"]')?.textContent ?? ''), null, { timeout: 90_000 });
    expect(await progress().getAttribute('aria-valuenow')).toBe('2000');
    const hist = page.getByTestId('mc-histogram');
    await hist.waitFor();
    for (const mark of ['P10', 'P50', 'P90']) expect(await hist.locator(`g[data-mark="${mark}"]`).count()).toBe(1);
    expect(await page.getByTestId('mc-loss').textContent()).toMatch(/Chance the proposal loses money against rebuilding every engine: \d+(\.\d)? %/);
    expect(await page.getByTestId('mc-trucks').locator('tbody tr').count()).toBe(24);
    await hist.scrollIntoViewIfNeeded();
    await screenshot(page, 'risk-monte-carlo-histogram');
  });

  it('cancels a long run while it is in progress', async () => {
    await page.getByLabel('Iterations', { exact: true }).fill('100000');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await page.waitForFunction(() => /of 100,000 iterations · running/.test(document.querySelector('[data-testid="mc-status"]')?.textContent ?? ''));
    // progress moves before we cancel
    await page.waitForFunction(() => Number(document.querySelector('[role="progressbar"]')?.getAttribute('aria-valuenow')) > 0, null, { timeout: 60_000 });
    await progress().scrollIntoViewIfNeeded();
    await screenshot(page, 'risk-monte-carlo-running');
    await page.getByRole('button', { name: 'Cancel run' }).click();
    await page.waitForFunction(() => /cancelled/.test(document.querySelector('[data-testid="mc-status"]')?.textContent ?? ''), null, { timeout: 30_000 });
    const done = Number(await progress().getAttribute('aria-valuenow'));
    expect(done).toBeGreaterThan(0);
    expect(done).toBeLessThan(100000);
    expect(await page.getByRole('button', { name: 'Cancel run' }).count()).toBe(0);
    await signOut(page);
  });

  it('lets a viewer read the latest run but not start one', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/risk`);
    await status().waitFor();
    expect(await status().textContent()).toMatch(/cancelled/);
    expect(await page.getByRole('button', { name: 'Run Monte Carlo' }).count()).toBe(0);
    // the proposal line says how many repowered trucks the fleet programme times past their next overhaul,
    // counted here from the drivers route's timings
    const drivers = await (await page.request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/drivers`)).json();
    const later = Object.values(drivers.proposal.timings as Record<string, { kind: string; k: number; delayMonths: number }>).filter((t) => t.kind === 'event' && (t.k > 1 || t.delayMonths > 0)).length;
    const note = page.getByTestId('risk-timing-note');
    if (later > 0) expect(await note.textContent()).toContain(`times ${later} repowered truck${later === 1 ? '' : 's'} later than`);
    else expect(await note.count()).toBe(0);
    // the page's fleet break-even holds the server a while: let it finish before signing out
    await page.getByTestId('break-even-table').waitFor({ timeout: 180_000 });
    await signOut(page);
  }, 300_000);
});
