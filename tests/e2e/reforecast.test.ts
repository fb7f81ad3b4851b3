/**
 * Issue 20, re-forecast: the demo analyst opens the approved demo case's plan
 * against actual, reads the re-forecast preview, starts the re-forecast case
 * and lands on the new draft, whose trucks carry the figures from readings.
 * Also: the readings page's import template downloads.
 */
import fs from 'node:fs';
import ExcelJS from 'exceljs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { openBrowser, screenshot, signIn, WS } from './support/browser';

const APPROVED = 'North Pit 300 t repower programme (approved 2024-11)';
const NEW_NAME = `${APPROVED} — re-forecast 2026-11`;
const num = (s: string | null) => Number((s ?? '').replace(/[^\d.]/g, ''));

describe('re-forecast in the browser', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => {
    await close();
    // the new draft goes, so the demo's cases are as seeded for the other files
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await k('business_cases').where({ name: NEW_NAME }).delete();
    await k.destroy();
  });

  it('the analyst reads the preview on the approved case, starts the re-forecast and reads a truck\u2019s updated engine hours on the new draft', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: APPROVED }).first().click();
    await page.getByTestId('actuals-link').click();
    const panel = page.getByTestId('reforecast-panel');
    await panel.getByTestId('reforecast-table').waitFor();
    expect(await panel.getByTestId('reforecast-summary').textContent()).toContain('Readings to 2026-11');
    expect(await panel.getByTestId('reforecast-summary').textContent()).toContain("The new case's plan starts in 2026-12");

    // T3-14 was repowered in 2025-07: its engine type changes, and its engine hours count from the repower
    const t14 = panel.getByTestId('reforecast-T3-14');
    expect(await t14.getByTestId('reforecast-engine').getAttribute('data-changed')).toBe('yes');
    expect(await t14.getByTestId('reforecast-engine').textContent()).toContain('km-2700-bypass');
    expect(await t14.getByTestId('reforecast-note').textContent()).toContain('repowered on 2025-07-14');
    const hours = t14.getByTestId('reforecast-engineHours');
    expect(await hours.getAttribute('data-changed')).toBe('yes');
    const caseHours = num(await hours.locator('div').first().textContent());
    const nextHours = num(await hours.getByTestId('next').textContent());
    expect(caseHours).toBe(18200);
    // 17 months on the new engine (2025-07 to 2026-11) at roughly 5,800 h a year: far below the old engine's 18,200 h
    expect(nextHours).toBeGreaterThan(6000);
    expect(nextHours).toBeLessThan(9000);
    // T3-05's window is the last 12 months: shown with its dates
    expect(await panel.getByTestId('reforecast-T3-05').textContent()).toContain('2025-12 to 2026-11 (12 months)');
    await screenshot(page, 'reforecast-preview');

    await panel.getByRole('button', { name: 'Start re-forecast case' }).click();
    await panel.getByTestId('reforecast-created').waitFor();
    expect(await panel.getByTestId('reforecast-created').textContent()).toContain(NEW_NAME);
    await panel.getByTestId('reforecast-open').click();
    await page.waitForURL(/\/cases\/\d+$/);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain(NEW_NAME);

    // the draft holds its own figures: T3-14's engine hours from its readings
    const own = page.getByTestId('own-truck-figures');
    await own.waitFor();
    expect(num(await own.getByTestId('own-figures-T3-14').getByTestId('engine-hours').textContent())).toBe(nextHours);
    expect(await own.getByTestId('own-figures-T3-14').textContent()).toContain('km-2700-bypass');
    // and the case evaluates them: the truck page says so
    await page.goto(`${page.url()}/trucks/T3-14`);
    await page.getByText(`Engine km-2700-bypass at ${nextHours.toLocaleString('en-US')} h`).waitFor();
    await screenshot(page, 'reforecast-new-draft-truck');
  });

  it('the readings page offers the import template; the XLSX explains each column', async () => {
    await page.goto(`${baseURL}/${WS}/fleet/readings`);
    const link = page.getByTestId('readings-template').getByRole('link', { name: 'XLSX, with a sheet explaining each column' });
    const [download] = await Promise.all([page.waitForEvent('download'), link.click()]);
    expect(download.suggestedFilename()).toBe('readings-template.xlsx');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(fs.readFileSync((await download.path())!) as unknown as ArrayBuffer);
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Readings', 'Columns']);
    expect((wb.getWorksheet('Readings')!.getRow(1).values as unknown[]).slice(1, 4)).toEqual(['unit_number', 'month', 'hour_meter_h']);
    expect((wb.getWorksheet('Columns')!.getRow(1).values as unknown[]).slice(1)).toEqual(['column', 'required', 'what it holds', 'example']);
  });
});
