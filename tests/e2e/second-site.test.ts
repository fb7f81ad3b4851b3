import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('the second demo site', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('a consultant who serves both sites switches to Corrin Flats and finds its own fleet and draft case', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}`);
    await page.getByRole('combobox', { name: 'Workspace' }).selectOption({ label: 'Corrin Flats Iron (second demo site)' });
    await page.waitForURL(`${baseURL}/corrin-flats`);
    // the page may still show the previous site for a moment after the URL changed
    await page.getByRole('heading', { level: 1, name: 'Corrin Flats Iron (second demo site)' }).waitFor();
    const counts = await page.getByTestId('overview-counts').locator('dd').allTextContents();
    expect(counts).toEqual(['7', '2', '1', '1', '1']);
    await page.getByTestId('drafts-list').getByRole('link', { name: 'Corrin Flats haul fleet — base' }).waitFor();
    await screenshot(page, 'second-site-overview');

    await page.getByRole('link', { name: 'Fleet register' }).click();
    await page.waitForURL(`${baseURL}/corrin-flats/fleet`);
    const table = page.getByTestId('fleet-table');
    await table.locator('tbody tr').first().waitFor();
    expect(await page.getByTestId('truck-count').textContent()).toBe('7 of 7 trucks');
    expect(await table.locator('tr[data-unit="CF-103"]').textContent()).toContain('In-service 1,600 kW (180 t class)');
    expect(await table.textContent()).not.toContain('T3-01');

    await page.getByRole('combobox', { name: 'Workspace' }).selectOption({ label: 'Aldervane Copper — North Pit' });
    await page.waitForURL(`${baseURL}/${WS}`);
    await page.getByRole('heading', { level: 1, name: 'Aldervane Copper — North Pit' }).waitFor();
    expect(await page.getByTestId('overview-counts').locator('dd').first().textContent()).not.toBe('7');
    await signOut(page);
  });
});
