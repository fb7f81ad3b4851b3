import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, WS } from './support/browser';

describe('valuation, share of lost margin and failed core credit in the register', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('an analyst sets an assumption set to the median path and 50 % lost margin, and reads it back after a reload', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/assumptions`);
    const table = page.getByTestId('assumption-table');
    await table.getByRole('button', { name: 'Edit High fuel', exact: true }).click();
    const form = page.getByTestId('assumption-form');
    await form.waitFor();
    // the demo's values: expected valuation, the whole margin lost, shown as a percentage
    expect(await form.getByLabel('Valuation', { exact: true }).inputValue()).toBe('expected');
    expect(await form.getByLabel('Share of lost margin (%)', { exact: true }).inputValue()).toBe('100');
    await form.getByText('0 % where a standby truck covers every day down').waitFor();

    // a share above 100 % is refused on the field, nothing saved
    await form.getByLabel('Share of lost margin (%)', { exact: true }).fill('120');
    await form.getByRole('button', { name: 'Save assumption set' }).click();
    expect(await form.locator('#f-assumptions-lostMarginShare-err').textContent()).toMatch(/at most 1 \(100 %\)/);

    await form.getByLabel('Valuation', { exact: true }).selectOption({ label: 'Median path (one deterministic path)' });
    await form.getByLabel('Share of lost margin (%)', { exact: true }).fill('50');
    await screenshot(page, 'assumption-valuation-form');
    await form.getByRole('button', { name: 'Save assumption set' }).click();
    await form.waitFor({ state: 'detached' });

    await page.reload();
    const row = table.locator('tbody tr').filter({ has: page.getByRole('cell', { name: 'High fuel', exact: true }) });
    await row.waitFor();
    const cells = (await row.locator('td').allTextContents()).map((c) => c.trim());
    expect(cells.slice(9, 11)).toEqual(['median path', '50 %']);
    await table.getByRole('button', { name: 'Edit High fuel', exact: true }).click();
    await form.waitFor();
    expect(await form.getByLabel('Valuation', { exact: true }).inputValue()).toBe('median-path');
    expect(await form.getByLabel('Share of lost margin (%)', { exact: true }).inputValue()).toBe('50');
    // stored as a fraction
    const sets = await page.evaluate(async (ws) => (await fetch(`/api/workspaces/${ws}/assumption-sets`)).json(), WS);
    const stored = sets.items.find((s: { name: string }) => s.name === 'High fuel');
    expect([stored.assumptions.valuation, stored.assumptions.lostMarginShare]).toEqual(['median-path', 0.5]);

    // back to the demo's values, for the other browser tests: 100 % is stored as 1
    await form.getByLabel('Valuation', { exact: true }).selectOption('expected');
    await form.getByLabel('Share of lost margin (%)', { exact: true }).fill('100');
    await form.getByRole('button', { name: 'Save assumption set' }).click();
    await form.waitFor({ state: 'detached' });
    const after = await page.evaluate(async (ws) => (await fetch(`/api/workspaces/${ws}/assumption-sets`)).json(), WS);
    const restored = after.items.find((s: { name: string }) => s.name === 'High fuel');
    expect([restored.assumptions.valuation, restored.assumptions.lostMarginShare]).toEqual(['expected', 1]);
  });

  it('an analyst gives an offer a failed core credit, is refused one above module + install, and clears it again', async () => {
    await page.goto(`${baseURL}/${WS}/offers`);
    const table = page.getByTestId('offer-table');
    const row = () => table.locator('tbody tr').filter({ hasText: 'brannock-bd2000' }).first();
    await row().waitFor();
    await table.getByRole('button', { name: 'Edit brannock-bd2000' }).click();
    const form = page.getByTestId('offer-form');
    await form.waitFor();
    const field = form.getByLabel('Failed core credit (USD)', { exact: true });
    expect(await field.inputValue()).toBe('50000'); // the demo's figure
    await form.getByText('credit for a core that failed in service; blank: the core credit').waitFor();

    await field.fill('5000000');
    await form.getByRole('button', { name: 'Save offer' }).click();
    expect(await form.locator('#f-failedCoreCredit-err').textContent()).toMatch(/must not exceed module price \+ install cost/);

    await field.fill('42000');
    await form.getByRole('button', { name: 'Save offer' }).click();
    await form.waitFor({ state: 'detached' });
    await page.reload();
    await row().waitFor();
    expect((await row().locator('td').nth(6).textContent())?.trim()).toBe('42,000');
    await screenshot(page, 'offer-failed-core-credit');

    await table.getByRole('button', { name: 'Edit brannock-bd2000' }).click();
    await form.waitFor();
    expect(await field.inputValue()).toBe('42000');
    await field.fill('');
    await form.getByRole('button', { name: 'Save offer' }).click();
    await form.waitFor({ state: 'detached' });
    await page.reload();
    await row().waitFor();
    expect((await row().locator('td').nth(6).textContent())?.trim()).toBe('= core credit');

    // back to the demo's figure, for the other browser tests
    await table.getByRole('button', { name: 'Edit brannock-bd2000' }).click();
    await form.waitFor();
    expect(await field.inputValue()).toBe('');
    await field.fill('50000');
    await form.getByRole('button', { name: 'Save offer' }).click();
    await form.waitFor({ state: 'detached' });
    await row().getByRole('cell', { name: '50,000', exact: true }).waitFor();
  });
});
