/**
 * An analyst compares two cases from the cases list: picks case A and case B,
 * reads what changed in the inputs and the results, downloads the CSV; then a
 * revision's page links to what changed since the revision before it.
 */
import fs from 'node:fs';
import type { Knex } from 'knex';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createKnex } from '@/lib/db/connection';
import { WS, apiHeaders, openBrowser, screenshot, signIn, signOut } from './support/browser';

describe('two cases side by side', () => {
  let b: Awaited<ReturnType<typeof openBrowser>>;
  let k: Knex;
  let base: number;
  let high: number;

  beforeAll(async () => {
    b = await openBrowser();
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await signIn(b.page, b.baseURL, 'analyst@aldervane.test');
    const opts = await (await b.page.request.get(`${b.baseURL}/api/workspaces/${WS}/cases/options`)).json();
    const set = (name: string) => opts.assumptionSets.find((s: { name: string }) => s.name === name).id;
    const trucks = opts.trucks.slice(0, 3).map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null }));
    const make = async (name: string, setName: string, selection: unknown[]) => {
      const r = await b.page.request.post(`${b.baseURL}/api/workspaces/${WS}/cases`, { headers: apiHeaders(b.baseURL), data: { name, assumptionSetId: set(setName), selection } });
      expect(r.status()).toBe(201);
      return (await r.json()).case.id as number;
    };
    base = await make('Compare me: base', 'Base', trucks.slice(0, 2));
    high = await make('Compare me: high fuel', 'High fuel', trucks);
  });
  afterAll(async () => {
    await k?.destroy();
    await b?.close();
  });

  it('picks two cases, reads the changes largest first and downloads them as CSV', async () => {
    const { page, baseURL } = b;
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: 'Compare two cases' }).click();
    await page.getByRole('heading', { name: 'Compare two cases' }).waitFor();
    await page.getByLabel('Case A (from)').selectOption({ label: `Compare me: base (#${base}, draft)` });
    await page.getByLabel('Case B (to)').selectOption({ label: `Compare me: high fuel (#${high}, draft)` });
    const inputs = page.getByTestId('input-changes');
    await inputs.waitFor();
    // the address follows the choice (the page replaces it once the comparison is shown)
    await page.waitForURL((u) => u.search.includes(`a=${base}&b=${high}`));

    // the fuel price of the two demo sets: Base 1.05, High fuel 1.35 USD per litre
    const fuel = inputs.locator('tbody tr', { has: page.getByRole('cell', { name: 'Fuel price', exact: true }) });
    expect(await fuel.locator('td').allTextContents()).toEqual(['Assumptions', '', 'Fuel price', 'USD per litre', '1.05', '1.35', '+0.3']);
    // the truck only in B comes before the number changes
    const first = await inputs.locator('tbody tr').first().locator('td').allTextContents();
    expect(first[2]).toBe('In the case');
    expect(first[6]).toBe('only in B');

    const results = page.getByTestId('result-changes');
    const firstResult = await results.locator('tbody tr').first().locator('td').allTextContents();
    expect(firstResult[0]).toBe('Fleet');
    // the figures are each case's own: the fleet NPV of rebuilding is on both results pages
    const [ra, rb] = await Promise.all([base, high].map(async (id) => (await (await page.request.get(`${baseURL}/api/workspaces/${WS}/cases/${id}/result`)).json()).result.fleet.npv.rebuild));
    const rebuild = results.locator('tbody tr', { has: page.getByRole('cell', { name: 'NPV rebuild', exact: true }) }).first();
    const cells = await rebuild.locator('td').allTextContents();
    const shown = (x: number) => (x < 0 ? `(${Math.round(-x).toLocaleString('en-US')})` : Math.round(x).toLocaleString('en-US'));
    expect(cells.slice(0, 4)).toEqual(['Fleet', 'NPV rebuild', shown(ra), shown(rb)]);
    await screenshot(page, 'case-compare');

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download CSV' }).click()]);
    expect(download.suggestedFilename()).toBe('compare-Compare-me-base-Compare-me-high-fuel.csv');
    const rows = Papa.parse<string[]>(fs.readFileSync(await download.path(), 'utf8').trim()).data;
    expect(rows[0].slice(5)).toEqual([`Case A: Compare me: base (#${base})`, `Case B: Compare me: high fuel (#${high})`, 'Change (B − A; results rounded to cents)']);
    expect(rows).toContainEqual(['Input', 'Assumptions', '', 'Fuel price', 'USD per litre', '1.05', '1.35', '0.3']);
    const csvRebuild = rows.find((r) => r[0] === 'Result' && r[1] === 'Fleet' && r[3] === 'NPV rebuild');
    expect(Number(csvRebuild?.[5])).toBeCloseTo(ra, 2);
  });

  it('links a revision to what changed since the revision before it', async () => {
    const { page, baseURL } = b;
    // a revision is a copy of a closed case; here the second case is marked as the revision of the first
    await k('business_cases').where({ id: high }).update({ revisionOf: base });
    await page.goto(`${baseURL}/${WS}/cases/${high}`);
    await page.getByRole('link', { name: `What changed since the previous revision (Compare me: base, #${base})` }).click();
    await page.getByTestId('input-changes').waitFor();
    expect(await page.getByLabel('Case A (from)').inputValue()).toBe(String(base));
    expect(await page.getByLabel('Case B (to)').inputValue()).toBe(String(high));
    // the approval page of the revision links to the same comparison
    await page.goto(`${baseURL}/${WS}/approvals/${high}`);
    await page.getByTestId('compare-previous').click();
    await page.getByTestId('input-changes').waitFor();
    expect(await page.getByLabel('Case A (from)').inputValue()).toBe(String(base));
    expect(await page.getByLabel('Case B (to)').inputValue()).toBe(String(high));
    await signOut(page);
  });
});
