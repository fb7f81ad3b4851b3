import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

/** "2027-01" + n months, worked by hand in the test (not by the app's helper). */
const plusMonths = (n: number) => {
  const d = new Date();
  const total = d.getUTCFullYear() * 12 + d.getUTCMonth() + n;
  return `${Math.floor(total / 12)}-${String((total % 12) + 1).padStart(2, '0')}`;
};

describe('the fleet register shows when each engine is due for its planned overhaul', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('a viewer reads engine names, hours to planned overhaul and the due month, and how they are worked out', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/fleet`);
    const table = page.getByTestId('fleet-table');
    await table.locator('tbody tr').first().waitFor();
    const headers = (await table.locator('thead th').allTextContents()).map((h) => h.trim());
    const col = (name: string) => headers.indexOf(name);
    expect(col('Hours to planned overhaul (h)')).toBeGreaterThan(0);
    expect(col('Overhaul due (month)')).toBeGreaterThan(0);
    const cells = async (unit: string) => table.locator(`tr[data-unit="${unit}"] td`).allTextContents();

    // T2-03 (demo data): 1,900 kW legacy engine, planned life 18,000 h, 11,800 h on it, 6,200 h a year:
    // 18,000 − 11,800 = 6,200 h to go, 12 · 6,200 / 6,200 = 12 months from now
    const t203 = await cells('T2-03');
    expect(t203[col('Engine type')]).toBe('In-service 1,900 kW (230 t class)');
    expect(t203[col('Hours to planned overhaul (h)')]).toBe('6,200');
    expect(t203[col('Overhaul due (month)')]).toBe(plusMonths(12));
    // T3-17: 20,400 h on an 18,000 h life: due now
    const t317 = await cells('T3-17');
    expect(t317[col('Hours to planned overhaul (h)')]).toBe('0');
    expect(t317[col('Overhaul due (month)')]).toBe('Now');
    // T3-04: 14,500 h to go but only 9,000 h of remaining life: no overhaul while it runs
    const t304 = await cells('T3-04');
    expect(t304[col('Overhaul due (month)')]).toBe('—');
    expect(await table.textContent()).not.toContain('ac-2600-legacy');

    expect(await table.getByRole('button', { name: 'Overhaul due (month)' }).getAttribute('title')).toMatch(/12 · hours ÷ annual hours/);
    expect(await page.getByTestId('overhaul-help').textContent()).toContain('planned life minus the engine’s hours');

    // sorting by the due month puts the engines due now first
    await table.getByRole('button', { name: 'Overhaul due (month)' }).click();
    const first = await table.locator('tbody tr').first().locator('td').nth(col('Overhaul due (month)')).textContent();
    expect(first).toBe('Now');
    await screenshot(page, 'fleet-register-overhaul-due');
    await signOut(page);
  });
});
