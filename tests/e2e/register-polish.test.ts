import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('new assumption sets, deleting offers, and the forgot-password throttle', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-e2e-polish-'));

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => {
    await close();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('an analyst starts a new assumption set from the reference values and names it', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/assumptions`);
    await page.getByRole('button', { name: 'New set' }).click();
    const form = page.getByTestId('assumption-form');
    await form.waitFor();
    const value = (label: string) => form.getByLabel(label, { exact: true }).inputValue();
    expect(await value('Discount rate (nominal, fraction)')).toBe('0.08');
    expect(await value('Inflation (fraction/yr)')).toBe('0.025');
    expect(await value('Fuel price (USD/L)')).toBe('1.05');
    expect(await value('Fuel escalation (fraction/yr)')).toBe('0.03');
    expect(await value('Fuel density (kg/L)')).toBe('0.835');
    expect(await value('CO2 per litre (kg/L)')).toBe('2.697');
    expect(await value('Lube price (USD/L)')).toBe('4.2');
    expect(await value('Labour rate (USD/h)')).toBe('115');
    expect(await value('Carbon price (USD/t CO2)')).toBe('0');
    expect(await value('Margin per tonne (USD/t)')).toBe('2.5');
    expect(await value('Tax rate (fraction)')).toBe('0.3');
    expect(await value('Depreciation years')).toBe('7');
    expect(await value('Depreciation')).toBe('macrs');
    expect(await value('Overhauls and repairs')).toBe('expense');
    expect(await value('Cash-flow timing')).toBe('end-of-year');

    // the name is the user's to type; an empty one is refused on the field, nothing saved
    await form.getByRole('button', { name: 'Add assumption set' }).click();
    expect(await form.locator('#f-name-err').textContent()).toMatch(/name must not be empty/i);
    const table = page.getByTestId('assumption-table');
    const rowsBefore = await table.locator('tbody tr').count();
    await form.getByLabel('Name', { exact: true }).fill('Site reference 2027');
    await form.getByLabel('Fuel price (USD/L)').fill('1.12');
    await screenshot(page, 'assumption-new-set-form');
    await form.getByRole('button', { name: 'Add assumption set' }).click();
    await form.waitFor({ state: 'detached' });
    const row = table.locator('tbody tr').filter({ hasText: 'Site reference 2027' });
    await row.waitFor();
    expect(await table.locator('tbody tr').count()).toBe(rowsBefore + 1);
    const cells = (await row.locator('td').allTextContents()).map((c) => c.trim());
    expect(cells.slice(0, 9)).toEqual(['Site reference 2027', '8.0 %', '2.5 %', '1.12', '3.0 %', '0', '2.50', '30 %', 'macrs 7 yr']);
    await page.getByText('Added "Site reference 2027".').waitFor();
    await screenshot(page, 'assumption-new-set-added');
  });

  it('an analyst deletes an unused offer with its quote, and is told which trucks hold an offer back', async () => {
    await page.goto(`${baseURL}/${WS}/offers`);
    const table = page.getByTestId('offer-table');
    // kestrel-km2700 is the own offer of most demo trucks: the refusal names them
    page.once('dialog', (d) => d.accept());
    await table.getByRole('button', { name: 'Delete kestrel-km2700' }).click();
    const notice = page.getByTestId('offer-notice');
    await notice.waitFor();
    expect(await notice.getAttribute('role')).toBe('alert');
    expect(await notice.textContent()).toMatch(/^This repower offer is still named by \d+ truck\(s\) \(T3-\d\d, T3-\d\d, T3-\d\d and \d+ more\).*give them another offer first\. Nothing was deleted\.$/);
    await table.locator('tbody tr').filter({ hasText: 'kestrel-km2700' }).waitFor();
    await screenshot(page, 'offers-delete-refused');

    // a new offer with a quote document, then deleted
    await page.getByRole('button', { name: 'Add offer' }).click();
    const form = page.getByTestId('offer-form');
    await form.getByLabel('Key (id in case files)').fill('trial-offer-x1');
    await form.getByLabel('Supplier').fill('Invented Modules Ltd');
    await form.getByLabel('Module price (USD)').fill('1400000');
    await form.getByLabel('Install cost (USD)').fill('120000');
    await form.getByLabel('Core credit (USD)', { exact: true }).fill('90000');
    await form.getByLabel('Days down (d)').fill('3');
    await form.getByRole('button', { name: 'Add offer' }).click();
    // the offer's own row (its quotes open in a row of their own below it)
    const row = table.locator('tbody tr').filter({ has: page.getByRole('button', { name: 'Delete trial-offer-x1' }) });
    await row.waitFor();
    await row.getByRole('button', { name: 'Quotes' }).click();
    const pdf = path.join(dir, 'Trial quote.pdf');
    fs.writeFileSync(pdf, '%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n');
    const docs = page.getByTestId('quote-documents');
    await docs.locator('input[type=file]').setInputFiles(pdf);
    const link = docs.getByRole('link', { name: 'Trial quote.pdf' });
    await link.waitFor();
    const docUrl = `${baseURL}${await link.getAttribute('href')}`;
    expect((await context.request.get(docUrl)).status()).toBe(200);

    let asked = '';
    page.once('dialog', (d) => {
      asked = d.message();
      void d.accept();
    });
    await row.getByRole('button', { name: 'Delete trial-offer-x1' }).click();
    await row.waitFor({ state: 'detached' });
    expect(asked).toBe('Delete the repower offer trial-offer-x1 from Invented Modules Ltd, with its quote documents?');
    expect(await page.getByTestId('offer-notice').textContent()).toBe('Deleted trial-offer-x1 and its quote documents.');
    expect(await table.getByText('trial-offer-x1').count()).toBe(0);
    expect((await context.request.get(docUrl)).status()).toBe(404);
    await screenshot(page, 'offers-deleted');
    await signOut(page);
  });

  it('a viewer sees no delete buttons on the offers page', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/offers`);
    await page.getByTestId('offer-table').locator('tbody tr').first().waitFor();
    expect(await page.getByRole('button', { name: /^Delete / }).count()).toBe(0);
    await page.goto(`${baseURL}/${WS}/assumptions`);
    await page.getByTestId('assumption-table').waitFor();
    expect(await page.getByRole('button', { name: 'New set' }).count()).toBe(0);
    await signOut(page);
  });

  it('the forgot-password form says to wait after too many requests for one address', async () => {
    const ask = async () => {
      await page.goto(`${baseURL}/forgot-password`);
      await page.getByLabel('Email').fill('throttle-trial@example.test');
      await page.getByRole('button', { name: 'Mail me a reset link' }).click();
    };
    for (let i = 0; i < 3; i++) {
      await ask();
      expect(await page.getByTestId('forgot-done').textContent()).toMatch(/If an account uses that address/);
    }
    await ask();
    const error = page.getByTestId('forgot-error');
    await page.waitForFunction(() => (document.querySelector('[data-testid="forgot-error"]')?.textContent ?? '') !== '');
    expect(await error.textContent()).toMatch(/^Too many reset requests for this email or from your network\. Try again in 15 minutes; a link already sent stays valid for an hour\.$/);
    expect(await page.getByTestId('forgot-done').count()).toBe(0);
    await screenshot(page, 'forgot-password-throttled');
  });
});
