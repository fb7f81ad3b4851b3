import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { apiHeaders, openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('reading a change in the audit log', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('an approver reads which truck changed and the one field that did, with names instead of addresses; a viewer is refused', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    const items = (await (await context.request.get(`${baseURL}/api/workspaces/${WS}/trucks`)).json()).items as Array<Record<string, unknown>>;
    const truck = items.find((t) => t.unitNumber === 'T3-02') as Record<string, unknown>;
    const fields = ['unitNumber', 'payloadClass', 'engineTypeId', 'repowerOfferId', 'engineHours', 'remainingLifeHours', 'annualHours', 'loadFactor', 'tonnesPerHour', 'fuelBurnLitresPerHour'];
    const body = Object.fromEntries(fields.map((f) => [f, truck[f]]));
    const saved = await context.request.put(`${baseURL}/api/workspaces/${WS}/trucks/${truck.id}`, {
      headers: apiHeaders(baseURL),
      data: { ...body, notes: 'Turbo replaced under warranty', version: truck.version },
    });
    expect(saved.status()).toBe(200);
    await signOut(page);

    await signIn(page, baseURL, 'approver@aldervane.test');
    await page.getByRole('link', { name: 'Audit log' }).click();
    await page.waitForURL(`${baseURL}/${WS}/audit`);
    const kind = page.getByLabel('Kind');
    // the page may still show its loading state after the URL changed: wait for the filter's options
    await kind.locator('option', { hasText: 'Truck: changed' }).waitFor({ state: 'attached' });
    expect(await kind.locator('option').allTextContents()).toContain('Truck: changed');
    expect((await kind.textContent()) ?? '').not.toContain('business_case');
    await kind.selectOption({ label: 'Truck: changed' });
    await page.getByRole('button', { name: 'Filter' }).click();
    await page.waitForURL((u) => u.searchParams.get('kind') === 'truck:update');
    const row = page.getByTestId('audit-table').locator(':scope > tbody > tr').first();
    const cells = await row.locator(':scope > td').allTextContents();
    expect(cells[1]).toBe('Demo analyst');
    expect(cells[2]).toBe('Truck: changed');
    expect(cells[3]).toBe('Truck T3-02');
    const diff = row.getByTestId('audit-diff');
    expect(await diff.locator('th').allTextContents()).toEqual(['Notes']);
    expect(await diff.locator('del').textContent()).toBe('(empty)');
    expect(await diff.locator('ins').textContent()).toBe('Turbo replaced under warranty');
    expect(await page.getByTestId('audit-table').textContent()).not.toMatch(/@aldervane\.test|workspaceId|createdAt/);
    expect(await page.getByLabel('Person').textContent()).not.toContain('@');
    expect(await page.getByTestId('audit-who-reads').textContent()).toContain('Admins, approvers and analysts can read this log');
    await screenshot(page, 'audit-log-approver');
    await signOut(page);

    await signIn(page, baseURL, 'viewer@aldervane.test');
    expect(await page.getByRole('link', { name: 'Audit log' }).count()).toBe(0);
    await page.goto(`${baseURL}/${WS}/audit`);
    expect(await page.getByTestId('access-denied').textContent()).toContain('It needs the Admin or Approver or Analyst role');
    expect((await context.request.get(`${baseURL}/api/workspaces/${WS}/audit`)).status()).toBe(403);
    await signOut(page);
  });
});
