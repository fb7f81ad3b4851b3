import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { openBrowser, screenshot, signIn, signOut, WS, apiHeaders } from './support/browser';

/** Puts the demo fleet back as seeded (other browser files compare with it): drops the imported trucks and the test's own case, restores T3-01. */
async function restoreDemoFleet() {
  const demo = JSON.parse(fs.readFileSync(path.resolve('scenarios/aldervane-north-pit.json'), 'utf8'));
  const t301 = demo.trucks.find((t: { id: string }) => t.id === 'T3-01');
  const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
  const ws = await k('workspaces').where({ slug: WS }).first('id');
  await k('trucks').where({ workspaceId: ws.id }).andWhere('unitNumber', 'like', 'T5-%').delete();
  await k('trucks').where({ workspaceId: ws.id, unitNumber: 'T3-01' }).update({ engineHours: t301.engineHours, loadFactor: t301.loadFactor });
  await k('business_cases').where({ workspaceId: ws.id, name: 'Fleet test hold on T3-02' }).delete();
  await k.destroy();
}

const HEADER = 'unit_number,payload_class,engine_type,repower_offer,engine_hours_h,remaining_life_h,annual_hours_h,load_factor,tonnes_per_hour,fuel_burn_l_per_h,notes';
const line = (unit: string, hours: string) => `${unit},300 t,ac-2600-legacy,kestrel-km2700,${hours},52000,6200,0.5,810,,brought in from the planning sheet`;

describe('fleet register, import and quote documents in the browser', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-e2e-files-'));

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => {
    await close();
    fs.rmSync(dir, { recursive: true, force: true });
    await restoreDemoFleet();
  });

  it('analyst imports a fleet file with an error, sees the row errors, fixes the file and imports it', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.getByRole('link', { name: 'Import from file' }).click();
    await page.waitForURL(`${baseURL}/${WS}/fleet/import`);
    const file = path.join(dir, 'north-pit-additions.csv');
    fs.writeFileSync(file, [HEADER, line('T5-01', '4200'), line('T5-02', '"3,9OO"'), line('T5-03', '150')].join('\n'));
    await page.getByLabel('Fleet file (.csv or .xlsx)').setInputFiles(file);
    const problems = page.getByTestId('import-problems');
    await problems.waitFor();
    const text = await problems.textContent();
    expect(text).toContain('engine_hours_h');
    expect(text).toContain('"3,9OO" is not a number');
    expect(await problems.locator('tbody tr').first().locator('td').first().textContent()).toBe('3');
    expect(await page.getByRole('button', { name: /^Import \d+ truck/ }).count()).toBe(0);
    await screenshot(page, 'fleet-import-row-errors');

    fs.writeFileSync(file, [HEADER, line('T5-01', '4200'), line('T5-02', '3900'), line('T5-03', '150')].join('\n'));
    await page.getByLabel('Fleet file (.csv or .xlsx)').setInputFiles(file);
    await page.getByTestId('import-plan').waitFor();
    expect(await page.getByTestId('import-preview').textContent()).toContain('3 truck(s) to add, 0 to update');
    await screenshot(page, 'fleet-import-preview');
    await page.getByRole('button', { name: 'Import 3 truck(s)' }).click();
    expect(await page.getByTestId('import-done').textContent()).toContain('3 truck(s) added, 0 updated');

    await page.getByRole('link', { name: 'Back to the register' }).click();
    await page.getByLabel('Filter trucks').fill('T5-');
    await page.getByText('3 of 27 trucks').waitFor();
    const row = page.locator('tr[data-unit="T5-02"]');
    expect(await row.locator('td').nth(4).textContent()).toBe('3,900');
  });

  it('analyst edits a truck: a bad value is shown on its field, a good one is saved', async () => {
    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.getByRole('button', { name: 'Edit T3-01' }).click();
    const form = page.getByTestId('truck-form');
    await form.getByLabel('Load factor (0–1)').fill('1.3');
    await form.getByRole('button', { name: 'Save truck' }).click();
    await form.getByText('must be at most 1 (a fraction of rated power)').waitFor();
    await screenshot(page, 'fleet-truck-form-error');
    await form.getByLabel('Load factor (0–1)').fill('0.51');
    await form.getByLabel('Engine hours (h)').fill('1234');
    await form.getByRole('button', { name: 'Save truck' }).click();
    await form.waitFor({ state: 'detached' });
    const row = page.locator('tr[data-unit="T3-01"]');
    await row.getByText('1,234').waitFor();
    expect(await row.locator('td').nth(7).textContent()).toBe('0.51');
    await screenshot(page, 'fleet-register-analyst');
  });

  it('analyst tries to delete a truck that a draft case names: the refusal names the case and the truck stays', async () => {
    // a draft of this file's own, so the check holds whatever other browser files did to the demo case
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    const truck = await k('trucks').where({ workspaceId: ws.id, unitNumber: 'T3-02' }).first('id');
    const set = await k('assumption_sets').where({ workspaceId: ws.id }).orderBy('id').first('id');
    const now = new Date().toISOString();
    await k('business_cases').insert({ workspaceId: ws.id, name: 'Fleet test hold on T3-02', assumptionSetId: set.id, selection: JSON.stringify([{ truckId: truck.id, repowerOfferId: null }]), plan: '{}', status: 'draft', createdAt: now, updatedAt: now });
    await k.destroy();
    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.getByRole('button', { name: 'Edit T3-02' }).click();
    const form = page.getByTestId('truck-form');
    page.once('dialog', (d) => d.accept());
    await form.getByRole('button', { name: 'Delete truck' }).click();
    const message = page.getByTestId('truck-delete-error');
    await message.waitFor();
    const text = await message.textContent();
    expect(text).toMatch(/^This truck is still named by \d business case\(s\) \(.*“Fleet test hold on T3-02”.*\); take it out of them first\. Nothing was deleted\.$/);
    await screenshot(page, 'fleet-truck-delete-refused');
    await form.getByRole('button', { name: 'Cancel' }).click();
    expect(await page.locator('tr[data-unit="T3-02"]').count()).toBe(1);
  });

  it('analyst uploads a quote document; a file that is not a PDF or image is refused', async () => {
    await page.goto(`${baseURL}/${WS}/offers`);
    expect(await page.getByRole('note', { name: 'Safety caution' }).count()).toBe(1);
    await page.getByRole('button', { name: 'Quotes' }).first().click();
    const docs = page.getByTestId('quote-documents');
    const fake = path.join(dir, 'quote.pdf');
    fs.writeFileSync(fake, 'this is plain text pretending to be a PDF');
    await docs.locator('input[type=file]').setInputFiles(fake);
    expect(await page.getByTestId('quote-message').textContent()).toMatch(/not a PDF, PNG, JPEG or WebP file.*Nothing was saved/);
    const pdf = path.join(dir, 'Module quote Q-2231.pdf');
    fs.writeFileSync(pdf, '%PDF-1.4\n1 0 obj <<>> endobj\ntrailer <<>>\n%%EOF\n');
    await docs.locator('input[type=file]').setInputFiles(pdf);
    await docs.getByRole('link', { name: 'Module quote Q-2231.pdf' }).waitFor();
    await screenshot(page, 'offers-quote-uploaded');
    const [download] = await Promise.all([page.waitForEvent('download'), docs.getByRole('link', { name: 'Module quote Q-2231.pdf' }).click()]);
    expect(fs.readFileSync((await download.path())!, 'utf8')).toContain('%PDF-1.4');
    await signOut(page);
  });

  it('viewer sees the register with no edit controls, and a direct write answers 403', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.locator('tr[data-unit="T3-01"]').waitFor();
    expect(await page.getByTestId('fleet-table').locator('tbody tr').count()).toBe(27);
    expect(await page.getByRole('button', { name: 'Add truck' }).count()).toBe(0);
    expect(await page.getByRole('button', { name: /^Edit / }).count()).toBe(0);
    expect(await page.getByRole('link', { name: 'Import from file' }).count()).toBe(0);
    expect(await page.getByLabel('Upload a case file (.json)').count()).toBe(0);
    await screenshot(page, 'fleet-register-viewer');
    await page.goto(`${baseURL}/${WS}/offers`);
    await page.getByRole('button', { name: 'Quotes' }).first().click();
    await page.getByTestId('quote-documents').waitFor();
    expect(await page.getByTestId('quote-documents').locator('input[type=file]').count()).toBe(0);

    const trucks = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/trucks`)).json();
    const t = trucks.items.find((x: { unitNumber: string }) => x.unitNumber === 'T3-01');
    const put = await context.request.put(`${baseURL}/api/workspaces/${WS}/trucks/${t.id}`, { headers: apiHeaders(baseURL), data: { ...t, engineHours: 1, version: t.version } });
    expect(put.status()).toBe(403);
    const del = await context.request.delete(`${baseURL}/api/workspaces/${WS}/trucks/${t.id}`, { headers: apiHeaders(baseURL) });
    expect(del.status()).toBe(403);
    const after = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/trucks/${t.id}`)).json();
    expect(after.engineHours).toBe(1234);
    await signOut(page);
  });
});

describe('engine library, assumption sets and display units in the browser', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('analyst copies an assumption set and edits the copy', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/assumptions`);
    await page.getByRole('button', { name: 'Copy High fuel' }).click();
    const form = page.getByTestId('assumption-form');
    await form.waitFor();
    await form.getByLabel('Name').fill('High fuel, 10 % discount');
    await form.getByLabel('Discount rate (nominal, fraction)').fill('0.1');
    await form.getByRole('button', { name: 'Save assumption set' }).click();
    await form.waitFor({ state: 'detached' });
    const row = page.getByTestId('assumption-table').locator('tr', { hasText: 'High fuel, 10 % discount' });
    expect(await row.locator('td').nth(1).textContent()).toBe('10.0 %');
    await screenshot(page, 'assumption-sets');
    await signOut(page);
  });

  it('admin switches display units to US customary: the engine library shows and takes hp, lb/hp-h, US gal', async () => {
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/settings`);
    await page.getByLabel(/US customary/).check();
    await page.getByRole('button', { name: 'Save display settings' }).click();
    await page.getByText('Saved.').waitFor();
    await page.goto(`${baseURL}/${WS}/engines`);
    const table = page.getByTestId('engine-table');
    await table.getByText('Rated (hp)').waitFor();
    const legacy = table.locator('tr', { hasText: 'ac-2600-legacy' });
    // 2,600 kW ÷ 0.745 699 872 kW/hp = 3,486.6 hp; 212 g/kWh = 0.349 lb/hp-h
    expect(await legacy.locator('td').nth(2).textContent()).toBe('3,487');
    expect(await legacy.locator('td').nth(3).textContent()).toBe('0.349');
    await screenshot(page, 'engine-library-us-units');

    // the form reads and takes US customary too: a field left alone keeps its stored number exactly
    const stored = async () => {
      const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
      const ws = await k('workspaces').where({ slug: WS }).first('id');
      const row = await k('engine_types').where({ workspaceId: ws.id, key: 'ac-2600-legacy' }).first('ratedKw', 'bsfcGPerKwh', 'notes');
      await k.destroy();
      return row as { ratedKw: number; bsfcGPerKwh: number; notes: string };
    };
    const before = await stored();
    await page.getByRole('button', { name: 'Edit ac-2600-legacy' }).click();
    const form = page.getByTestId('engine-form');
    expect(await form.getByLabel('Rated power (hp)').inputValue()).toBe('3486.66');
    expect(await form.getByLabel('BSFC (lb/hp-h)').inputValue()).toBe('0.348525');
    await screenshot(page, 'engine-form-us-units');
    await form.getByLabel('Notes').fill('Checked in US customary');
    await form.getByRole('button', { name: 'Save engine type' }).click();
    await form.waitFor({ state: 'detached' });
    const untouched = await stored();
    expect(untouched.notes).toBe('Checked in US customary');
    expect(untouched.ratedKw).toBe(before.ratedKw);
    expect(untouched.bsfcGPerKwh).toBe(before.bsfcGPerKwh);
    // a value typed in hp is stored in kW: 3,500 hp × 0.745 699 872 kW/hp = 2,609.949 552 kW (NIST SP 811)
    await page.getByRole('button', { name: 'Edit ac-2600-legacy' }).click();
    await form.getByLabel('Rated power (hp)').fill('3500');
    await form.getByRole('button', { name: 'Save engine type' }).click();
    await form.waitFor({ state: 'detached' });
    expect(await legacy.locator('td').nth(2).textContent()).toBe('3,500');
    expect((await stored()).ratedKw).toBeCloseTo(2609.949552, 5);
    // put the demo engine back exactly as seeded (other browser files read it)
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    await k('engine_types').where({ workspaceId: ws.id, key: 'ac-2600-legacy' }).update({ ratedKw: before.ratedKw, notes: before.notes });
    await k.destroy();
    await page.goto(`${baseURL}/${WS}/settings`);
    await page.getByLabel(/Metric/).check();
    await page.getByRole('button', { name: 'Save display settings' }).click();
    await page.getByText('Saved.').waitFor();
    await signOut(page);
  });

  it('a viewer sees the settings but cannot change them', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/settings`);
    const display = page.getByTestId('display-settings');
    expect(await display.getByTestId('settings-who-changes').textContent()).toBe('Only a workspace admin can change these settings; ask one of your admins.');
    expect(await display.getByTestId('setting-units').textContent()).toBe('Metric (kW, L, g/kWh, L/h)');
    expect(await display.getByTestId('setting-negative').textContent()).toBe('(1,250)');
    // read-only: nothing to click, not greyed-out radios
    expect(await display.getByRole('radio').count()).toBe(0);
    expect(await page.getByTestId('approvals-setting').textContent()).toContain('A case needs 1 distinct approval (not counting the person who submitted it).');
    expect(await page.getByRole('spinbutton').count()).toBe(0);
    expect(await page.getByRole('button', { name: 'Save display settings' }).count()).toBe(0);
    await screenshot(page, 'settings-viewer-read-only');
    await page.goto(`${baseURL}/${WS}/engines`);
    await page.getByTestId('engine-table').waitFor();
    expect(await page.getByRole('button', { name: 'Add engine type' }).count()).toBe(0);
    await signOut(page);
  });
});
