import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS, apiHeaders } from './support/browser';

describe('case settings on the case page, and the truck charts', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseUrl = '';
  let caseApi = '';

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  const settings = () => page.getByTestId('case-settings');

  it('an analyst creates a case, then edits its name, assumption set, trucks and offer in place', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('button', { name: 'New case' }).first().click();
    await page.getByLabel('Name', { exact: true }).fill('Settings trial');
    await page.getByRole('button', { name: 'Create case' }).click();
    await page.waitForURL(/\/cases\/\d+$/);
    caseUrl = page.url();
    caseApi = `${baseURL}/api/workspaces/${WS}/cases/${caseUrl.split('/').pop()}`;
    await page.getByTestId('truck-table').waitFor();

    await page.getByRole('button', { name: 'Edit case settings' }).click();
    await settings().waitFor();
    expect(await page.getByLabel('Case name').inputValue()).toBe('Settings trial');
    expect(await page.getByLabel('Assumption set').locator('option:checked').textContent()).toBe('Base');

    // errors per field, nothing saved
    await page.getByLabel('Case name').fill('   ');
    await settings().getByLabel('All trucks').uncheck();
    await page.getByRole('button', { name: 'Save settings' }).click();
    expect(await page.locator('#settings-name-error').textContent()).toBe('must not be empty');
    expect(await page.getByTestId('selection-error').textContent()).toBe('choose at least one truck');
    expect(await page.getByLabel('Case name').getAttribute('aria-invalid')).toBe('true');
    await screenshot(page, 'case-settings-errors');
    expect((await (await context.request.get(caseApi)).json()).case).toMatchObject({ name: 'Settings trial', version: 1 });

    // a good change: another name, the High fuel set, two trucks, an offer chosen for one
    await page.getByLabel('Case name').fill('Settings trial — high fuel, two trucks');
    await page.getByLabel('Assumption set').selectOption({ label: 'High fuel' });
    await page.getByLabel('Include T2-01').check();
    await page.getByLabel('Include T3-09').check();
    const offerSelect = page.getByLabel('Offer for T2-01');
    const offerLabels = await offerSelect.locator('option').allTextContents();
    await offerSelect.selectOption({ index: offerLabels.length - 1 });
    expect(await page.getByTestId('selection-error').textContent()).toBe('');
    await screenshot(page, 'case-settings-form');
    await page.getByRole('button', { name: 'Save settings' }).click();
    await settings().waitFor({ state: 'detached' });

    await page.getByRole('heading', { level: 1, name: 'Settings trial — high fuel, two trucks' }).waitFor();
    await page.getByText(/High fuel assumptions, 2 trucks/).waitFor();
    expect(await page.getByTestId('truck-table').locator('tbody tr').count()).toBe(2);
    const stored = await (await context.request.get(caseApi)).json();
    expect(stored.case).toMatchObject({ name: 'Settings trial — high fuel, two trucks', assumptionSetName: 'High fuel', truckCount: 2, version: 2 });
    expect(stored.selection.filter((s: { repowerOfferId: number | null }) => s.repowerOfferId !== null)).toHaveLength(1);
    await screenshot(page, 'case-settings-saved');
  });

  it('says clearly when someone else changed the case first, and reloads their version', async () => {
    await page.getByRole('button', { name: 'Edit case settings' }).click();
    await settings().waitFor();
    // another person renames the case while this form is open
    const current = (await (await context.request.get(caseApi)).json()).case;
    const other = await context.request.patch(caseApi, { headers: apiHeaders(baseURL), data: { version: current.version, name: 'Renamed by a colleague' } });
    expect(other.status()).toBe(200);

    await page.getByLabel('Case name').fill('My late rename');
    await page.getByRole('button', { name: 'Save settings' }).click();
    const error = page.getByTestId('settings-error');
    await error.getByRole('button', { name: 'Reload the case' }).waitFor();
    expect(await error.textContent()).toMatch(/Someone else changed this since you loaded it\. Reload and try again\. Nothing was saved\./);
    await screenshot(page, 'case-settings-stale');
    await error.getByRole('button', { name: 'Reload the case' }).click();
    await page.waitForFunction(() => (document.querySelector('#settings-name') as HTMLInputElement | null)?.value === 'Renamed by a colleague');
    expect((await (await context.request.get(caseApi)).json()).case.name).toBe('Renamed by a colleague');
    await page.getByRole('button', { name: 'Cancel' }).click();
  });

  it('the cases list opens the settings form from its Edit link', async () => {
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: 'Edit settings of Renamed by a colleague' }).click();
    await page.waitForURL(/\/cases\/\d+\?edit=1$/);
    await settings().waitFor();
    expect(await page.getByLabel('Case name').inputValue()).toBe('Renamed by a colleague');
  });

  it('draws each truck chart with a thin rule-coloured axis and no dark line along the bottom', async () => {
    await page.goto(`${caseUrl}/trucks/T3-09`);
    for (const id of ['chart-cumulative', 'chart-costs', 'chart-fuel']) {
      const fig = page.getByTestId(id);
      // a horizontal line has no height, so it is never "visible" to the locator; attached is enough
      await fig.locator('svg .visx-axis-line').first().waitFor({ state: 'attached' });
      const lines = await fig.locator('svg .visx-axis-line').evaluateAll((els) => els.map((e) => ({ stroke: e.getAttribute('stroke'), width: e.getAttribute('stroke-width') })));
      expect(lines.length, `${id} has its two axes`).toBe(2);
      for (const l of lines) expect(l, id).toEqual({ stroke: '#e3e4e1', width: '1' });
      // nothing in ink or the dark grey is drawn as a line in the plot
      const dark = await fig.locator('svg line').evaluateAll((els) => els.filter((e) => ['#15181c', '#5d646d'].includes(e.getAttribute('stroke') ?? '')).length);
      expect(dark, id).toBe(0);
    }
    await page.getByTestId('chart-fuel').scrollIntoViewIfNeeded();
    await screenshot(page, 'case-truck-charts-axes');
    await signOut(page);
  });

  it('a viewer reads the case without any settings form; an edit request from them answers 403', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${caseUrl}?edit=1`);
    await page.getByTestId('truck-table').waitFor();
    expect(await page.getByRole('button', { name: 'Edit case settings' }).count()).toBe(0);
    expect(await page.getByTestId('case-settings').count()).toBe(0);
    const current = (await (await context.request.get(caseApi)).json()).case;
    const r = await context.request.patch(caseApi, { headers: apiHeaders(baseURL), data: { version: current.version, name: 'Viewer rename' } });
    expect(r.status()).toBe(403);
    await signOut(page);
  });
});
