/**
 * The expected valuation in the browser, as an analyst reads it: the demo
 * case's results page says which valuation its figures are and gives each
 * truck's chance of failing before its overhaul; a truck page has the
 * expected engine events per year; the engine library gives median and mean
 * lives (and warns of a planned life above the median); the risk page marks
 * the headline figure on the Monte Carlo histogram.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createKnex } from '../../lib/db/connection';
import { insertDemoCase } from '../support/demo-case';
import { apiHeaders, openBrowser, screenshot, signIn, WS } from './support/browser';

/** "1,234.5", "(1,234)" or "−12.3 %" → a number. */
const num = (s: string) => {
  const t = s.replace(/[,\s%]/g, '').replace('−', '-');
  return t.startsWith('(') ? -Number(t.slice(1, -1)) : Number(t);
};

describe('expected figures of the demo case', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;

  beforeAll(async () => {
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir') });
    caseId = await insertDemoCase(k, WS, 'Expected figures check');
    await k.destroy();
    ({ page, baseURL, close } = await openBrowser());
    await signIn(page, baseURL, 'analyst@aldervane.test');
  });
  afterAll(async () => close());

  it('results page: the valuation label, each truck’s chance of failing before its overhaul, ΔNPV with and without the gain', async () => {
    await page.goto(`${baseURL}/${WS}/cases/${caseId}`);
    const table = page.getByTestId('truck-table');
    await table.waitFor();
    expect(await page.getByTestId('valuation-label').first().textContent()).toBe('Expected over engine failures');
    const pcts = await table.getByTestId('fail-before-overhaul').allTextContents();
    expect(pcts).toHaveLength(24);
    for (const p of pcts) {
      expect(p).toMatch(/^\d{1,3}\.\d %$/);
      expect(num(p)).toBeGreaterThanOrEqual(0);
      expect(num(p)).toBeLessThanOrEqual(100);
    }
    // some engines of the demo fleet are well short of their life: a real chance, neither 0 nor 1
    expect(pcts.some((p) => num(p) > 0 && num(p) < 100)).toBe(true);
    const withGain = num((await page.getByTestId('fleet-delta-npv').textContent()) ?? '');
    const without = num((await page.getByTestId('fleet-delta-npv-no-gain').textContent()) ?? '');
    expect(Number.isFinite(withGain) && Number.isFinite(without)).toBe(true);
    expect(without).toBeLessThan(withGain);
    await screenshot(page, 'expected-results');
  });

  it('truck page: expected events per year for each policy, the failure chances, ΔNPV without the gain', async () => {
    await page.getByTestId('truck-table').getByRole('link', { name: 'T3-01' }).click();
    await page.waitForURL(/\/trucks\/T3-01$/);
    const events = page.getByTestId('expected-events-table');
    await events.waitFor();
    expect(await page.getByTestId('expected-events').locator('h3').textContent()).toBe('Expected engine events by year');
    const head = (await events.locator('thead').textContent()) ?? '';
    for (const w of ['Keep', 'Rebuild', 'Repower', 'Overhauls (no.)', 'Repairs (no.)', 'Repowers (no.)']) expect(head).toContain(w);
    const rows = events.locator('tbody tr');
    expect(await rows.count()).toBeGreaterThan(2);
    // the total row: the repower policy books one repower in all (planned or brought forward by a failure)
    const total = await rows.last().locator('td').allTextContents();
    expect(total).toHaveLength(9);
    expect(num(total[8])).toBeCloseTo(1, 2);
    // with fractions of events there is no path to draw
    expect(await page.getByTestId('event-timeline').count()).toBe(0);
    for (const p of ['keep', 'rebuild', 'repower']) expect(await page.getByTestId(`fail-before-${p}`).textContent()).toMatch(/^\d{1,3}\.\d %$/);
    expect(await page.getByTestId('delta-no-gain').textContent()).toMatch(/\d/);
    await screenshot(page, 'expected-truck');
    await events.scrollIntoViewIfNeeded();
    await screenshot(page, 'expected-truck-events');
  });

  it('engine library: median and mean life, the chance of failing before the planned life, and the notice', async () => {
    // an engine type whose planned life lies above its median life: η 25,000 h, β 2 → median 20,815 h
    const made = await page.request.post(`${baseURL}/api/workspaces/${WS}/engines`, {
      headers: apiHeaders(baseURL),
      data: {
        key: 'zz-long-life', name: 'Long planned life (test)', ratedKw: 2000, bsfcGPerKwh: 205, lifeHours: 30000, weibullShape: 2, weibullScaleHours: 25000,
        overhaulCost: 800000, overhaulDowntimeDays: 14, failureCost: 1400000, failureDowntimeDays: 30, serviceIntervalHours: 500, sumpLitres: 250,
        serviceKitCost: 900, serviceLabourHours: 4, topUpLitresPerHour: 0.05, notes: '',
      },
    });
    expect(made.status()).toBe(201);
    const made_ = await made.json();
    try {
      await page.goto(`${baseURL}/${WS}/engines`);
      const table = page.getByTestId('engine-table');
      await table.waitFor();
      const row = table.locator('tbody tr', { hasText: 'zz-long-life' });
      expect(num((await row.getByTestId('median-life').textContent()) ?? '')).toBe(Math.round(25000 * Math.sqrt(Math.LN2)));
      // η·Γ(1.5) = η·√π/2
      expect(num((await row.getByTestId('mean-life').textContent()) ?? '')).toBe(Math.round((25000 * Math.sqrt(Math.PI)) / 2));
      // the cell starts with a ▲ that marks a planned life above the median
      const fail = (await row.getByTestId('fail-before-life').textContent()) ?? '';
      expect(fail.startsWith('▲')).toBe(true);
      expect(num(fail.replace('▲', ''))).toBeCloseTo(100 * (1 - Math.exp(-((30000 / 25000) ** 2))), 1);
      const notice = page.getByTestId('life-above-median');
      expect(await notice.textContent()).toContain('Planned life is above the median life: most engines of this type fail before their overhaul. Review the Weibull figures.');
      expect(await notice.textContent()).toContain('zz-long-life');
      // a demo engine: median and mean read as numbers of hours
      const demo = table.locator('tbody tr', { hasText: 'ac-2600-legacy' });
      expect(num((await demo.getByTestId('median-life').textContent()) ?? '')).toBeGreaterThan(10000);
      expect(num((await demo.getByTestId('mean-life').textContent()) ?? '')).toBeGreaterThan(10000);
      await screenshot(page, 'expected-engine-library');
    } finally {
      const item = (made_.item ?? made_) as { id: number; version: number };
      await page.request.delete(`${baseURL}/api/workspaces/${WS}/engines/${item.id}?version=${item.version}`, { headers: apiHeaders(baseURL) });
    }
  });

  it('risk page: the headline marker on the Monte Carlo histogram and the mean beside it', async () => {
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/risk`);
    await page.getByLabel('Distribution of Fuel price').selectOption('fixed');
    await page.getByLabel('Iterations', { exact: true }).fill('500');
    await page.getByLabel('Seed', { exact: true }).fill('3');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await page.waitForFunction(() => /of 500 iterations · finished/.test(document.querySelector('[data-testid="mc-status"]')?.textContent ?? ''), null, { timeout: 90_000 });
    const mark = page.getByTestId('mc-headline-mark');
    await mark.waitFor();
    expect(await mark.locator('text').textContent()).toMatch(/^Headline \(expected over failures\) −?\(?[\d.,]+\)?$/);
    const check = page.getByTestId('mc-headline-check');
    expect(await check.textContent()).toContain('With failures sampled and every other input fixed, the Monte Carlo mean should lie within sampling');
    expect(num((await page.getByTestId('mc-headline').textContent()) ?? '')).toBeCloseTo(num((await mark.locator('text').textContent())!.split(') ')[1]), 2);
    expect(await page.getByTestId('mc-z').textContent()).toMatch(/\d\.\d\d/);
    expect(await page.getByTestId('mc-headline-verdict').textContent()).toMatch(/samples failures only/);
    await page.getByTestId('mc-histogram').scrollIntoViewIfNeeded();
    await screenshot(page, 'expected-risk-histogram');
  });
});
