import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { apiHeaders, openBrowser, screenshot, signIn, WS } from './support/browser';

const HEADER = 'unit_number,month,hour_meter_h,fuel_l,tonnes_t,overhauls,failures,days_down,repower_date,repower_cost,repower_engine_type,notes';
/** RD-01: 2024-12 to 2025-12, 500 h and 100,000 L a month (200 L/h), the meter from 30,000 h. */
const lines = () =>
  Array.from({ length: 13 }, (_, i) => {
    const month = i === 0 ? '2024-12' : `2025-${String(i).padStart(2, '0')}`;
    return `RD-01,${month},${30_000 + 500 * i},100000,400000,0,0,0,,,,`;
  });

describe('readings in the browser', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-e2e-readings-'));

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => {
    await close();
    fs.rmSync(dir, { recursive: true, force: true });
    // The test's own truck goes (its readings with it), so the demo fleet is as seeded for the other files.
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    await k('trucks').where({ workspaceId: ws.id, unitNumber: 'RD-01' }).delete();
    await k.destroy();
  });

  it('analyst imports a readings file, reads the derived figures and accepts them for the truck', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    const engines = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/engines`)).json();
    const created = await context.request.post(`${baseURL}/api/workspaces/${WS}/trucks`, {
      headers: apiHeaders(baseURL),
      data: {
        unitNumber: 'RD-01', payloadClass: '300 t', engineTypeId: engines.items[0].id, repowerOfferId: null, engineHours: 9000, remainingLifeHours: 40000,
        annualHours: 5000, loadFactor: 0.5, tonnesPerHour: 800, fuelBurnLitresPerHour: null, notes: 'readings browser test',
      },
    });
    expect(created.status()).toBe(201);

    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.getByRole('link', { name: 'Readings' }).click();
    await page.waitForURL(`${baseURL}/${WS}/fleet/readings`);

    // A file with a meter that falls in 2025-03 (row 5) is refused with its row and column.
    const file = path.join(dir, 'rd-01-readings.csv');
    const bad = lines();
    bad[3] = 'RD-01,2025-03,30500,100000,400000,0,0,0,,,,';
    fs.writeFileSync(file, [HEADER, ...bad].join('\n'));
    await page.getByLabel('Readings file (.csv or .xlsx)').setInputFiles(file);
    const problems = page.getByTestId('readings-problems');
    await problems.waitFor();
    const first = problems.locator('tbody tr').first().locator('td');
    expect(await first.nth(0).textContent()).toBe('5');
    expect(await first.nth(1).textContent()).toBe('hour_meter_h');
    expect(await first.nth(2).textContent()).toContain('30,500 h is lower than the reading of 2025-02 (31,000 h)');
    await screenshot(page, 'readings-import-row-errors');

    fs.writeFileSync(file, [HEADER, ...lines()].join('\n'));
    await page.getByLabel('Readings file (.csv or .xlsx)').setInputFiles(file);
    await page.getByRole('button', { name: 'Import 13 reading(s)' }).click();
    expect(await page.getByTestId('readings-import-done').textContent()).toContain('13 reading(s) added, 0 replaced');

    // The same file again is refused as duplicates unless "replace" is chosen.
    await page.getByLabel('Readings file (.csv or .xlsx)').setInputFiles(file);
    await page.getByTestId('readings-problems').waitFor();
    expect(await page.getByTestId('readings-preview').textContent()).toContain('13 problem(s) to fix first');
    await page.getByLabel(/replace them/).check();
    await page.getByRole('button', { name: 'Import 13 reading(s)' }).waitFor();
    expect(await page.getByTestId('readings-preview').textContent()).toContain('0 reading(s) to add, 13 to replace');

    await page.getByLabel('Window').selectOption('6');
    const row = page.getByTestId('derived-RD-01');
    // 6 × 500 h = 3,000 h in 6 months → 6,000 h a year; 600,000 L ÷ 3,000 h = 200 L/h; the meter 36,000 h
    await row.getByText('2025-07 to 2025-12 (6 months)').waitFor();
    expect(await row.getByTestId('annual-hours').textContent()).toBe('5,0006,000 from readings');
    expect(await row.getByTestId('fuel-burn').textContent()).toBe('not measured200.0 from readings');
    expect(await row.getByTestId('engine-hours').textContent()).toBe('9,00036,000 from readings');
    await screenshot(page, 'readings-derived');

    await row.getByRole('button', { name: 'Use these figures' }).click();
    expect(await page.getByTestId('accept-message').textContent()).toBe('RD-01: the register now holds the figures from readings as of 2025-12.');
    await row.getByText('register matches').waitFor();
    expect(await row.getByTestId('annual-hours').textContent()).toBe('6,0006,000 from readings');

    const trucks = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/trucks`)).json();
    const t = trucks.items.find((x: { unitNumber: string }) => x.unitNumber === 'RD-01');
    expect(t).toMatchObject({ annualHours: 6000, fuelBurnLitresPerHour: 200, engineHours: 36_000, version: 2 });
    await screenshot(page, 'readings-accepted');
  });
});
