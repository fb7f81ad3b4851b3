/**
 * A viewer downloads the workbook and the Summary CSV from the case page and
 * the workbook opens with the case's sheets and figures.
 */
import fs from 'node:fs';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { WS, openBrowser, screenshot, signIn, signOut, apiHeaders } from './support/browser';

describe('case export from the case page', () => {
  let b: Awaited<ReturnType<typeof openBrowser>>;
  let caseId: number;
  let truckCount: number;

  beforeAll(async () => {
    b = await openBrowser();
    // an analyst has a case to show (made through the API with the analyst's own session)
    await signIn(b.page, b.baseURL, 'analyst@aldervane.test');
    const opts = await (await b.page.request.get(`${b.baseURL}/api/workspaces/${WS}/cases/options`)).json();
    const base = opts.assumptionSets.find((s: { name: string }) => s.name === 'Base');
    const made = await b.page.request.post(`${b.baseURL}/api/workspaces/${WS}/cases`, {
      headers: apiHeaders(b.baseURL),
      data: { name: 'North Pit export check', assumptionSetId: base.id, selection: opts.trucks.map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null })) },
    });
    expect(made.status()).toBe(201);
    caseId = (await made.json()).case.id;
    truckCount = opts.trucks.length; // the demo fleet, plus any trucks other browser tests added
    await signOut(b.page);
  });
  afterAll(async () => b?.close());

  it('lets a viewer download the workbook and open it', async () => {
    const { page, baseURL } = b;
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    await page.getByRole('heading', { name: 'North Pit export check' }).waitFor();
    await screenshot(page, 'case-export-buttons');
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download workbook (XLSX)' }).click()]);
    expect(download.suggestedFilename()).toBe('North-Pit-export-check.xlsx');
    const file = await download.path();
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.readFile(file);
    expect(wb.worksheets.map((w) => w.name).slice(0, 3)).toEqual(['Cover', 'Summary', 'Assumptions']);
    const summary = wb.getWorksheet('Summary') as ExcelJS.Worksheet;
    expect(summary.getCell('A5').value).toBe('T2-01');
    const npv = (summary.getCell('E5').value as ExcelJS.CellFormulaValue);
    expect(npv.formula).toMatch(/^'T1 T2-01'!\$B\$\d+$/);
    expect(typeof npv.result).toBe('number');
    expect(wb.definedNames.getRanges('FuelPrice').ranges).toHaveLength(1);

    const [csv] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Summary CSV' }).click()]);
    const text = fs.readFileSync(await csv.path(), 'utf8');
    expect(text.split('\r\n')[0]).toContain('NPV keep (USD, rounded to cents)');
    // money to the cent: the first truck's NPV keep has at most two decimals
    expect(text.split('\r\n')[1].split(',')[2]).toMatch(/^-?\d+(\.\d{1,2})?$/);
    expect(truckCount).toBeGreaterThanOrEqual(24);
    expect(text.split('\r\n')).toHaveLength(1 + truckCount + 1 + 1);
  });
});
