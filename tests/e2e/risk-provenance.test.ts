/**
 * Monte Carlo provenance and the pinned run, as an analyst would: run a Monte
 * Carlo on the proposal, read the line above the result (settings, seed,
 * measure, author, time), reload and find the same settings in the form,
 * change one and see the panel say so, pin the run and see it pinned on the
 * panel and in the page header; open an earlier run from the list and get its
 * settings back; a viewer reads the pinned run but cannot pin.
 */
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { createKnex } from '../../lib/db/connection';
import { insertDemoCase } from '../support/demo-case';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('Monte Carlo provenance and the pinned run', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;
  let analystName = '';

  beforeAll(async () => {
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir') });
    caseId = await insertDemoCase(k, WS, 'Provenance check');
    analystName = (await k('users').where({ email: 'analyst@aldervane.test' }).first('name')).name;
    await k.destroy();
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  const provenance = () => page.getByTestId('mc-provenance');
  // a fleet break-even is a few hundred engine runs on the server: wait for it after each load or change of
  // measure, so that no abandoned computation holds the server while the next step waits for an answer
  const settled = async (subject: 'the proposal' | 'the repower') => {
    await page.getByRole('heading', { name: `Where ${subject} stops paying` }).waitFor({ timeout: 180_000 });
    await page.getByTestId('break-even-table').waitFor({ timeout: 180_000 });
    // a table shown from the page's cache is still asked for again: wait until nothing is in flight
    await page.waitForLoadState('networkidle', { timeout: 180_000 });
  };
  const reload = () => page.reload({ timeout: 180_000 });
  const text = async (id: string) => (await page.getByTestId(id).textContent()) ?? '';
  const finished = (iterations: string) =>
    page.waitForFunction((n) => new RegExp(`of ${n} iterations · finished`).test(document.querySelector('[data-testid="mc-status"]')?.textContent ?? ''), iterations, { timeout: 90_000 });

  it('runs a Monte Carlo on the proposal and shows what made the result above it', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/risk`, { timeout: 180_000 });
    await settled('the proposal');
    expect(await text('risk-pinned')).toContain('No Monte Carlo run is pinned to this case');
    expect(await page.getByLabel('Measure', { exact: true }).inputValue()).toBe('proposal');
    await page.getByTestId('mc-distributions').waitFor();
    // the discount rate drawn uniformly as well as the fuel price (the panel's starting point)
    await page.getByLabel('Distribution of Discount rate', { exact: true }).selectOption('uniform');
    await page.getByLabel('Iterations', { exact: true }).fill('300');
    await page.getByLabel('Seed', { exact: true }).fill('4321');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await finished('300');
    expect(await text('mc-prov-measure')).toBe('ΔNPV of the proposal against rebuilding every engine');
    expect(await text('mc-prov-iterations')).toBe('300');
    expect(await text('mc-prov-seed')).toBe('4321');
    expect(await text('mc-prov-failures')).toMatch(/sampled from each engine’s Weibull law/);
    const drawn = await text('mc-prov-drivers');
    expect(drawn).toMatch(/Fuel price: triangular \(min [\d.]+, mode [\d.]+, max [\d.]+\)/);
    expect(drawn).toMatch(/Discount rate: uniform \(min [\d.]+ %, max [\d.]+ %\)/);
    const line = (await provenance().textContent()) ?? '';
    expect(line).toContain(`by ${analystName} (analyst@aldervane.test)`);
    expect(line).toMatch(/Run of \d{4}-\d\d-\d\d \d\d:\d\d UTC/);
    expect(await text('mc-loss')).toMatch(/Chance the proposal loses money against rebuilding every engine: \d+(\.\d)? %/);
    expect(await page.getByTestId('mc-changed').count()).toBe(0);
    await screenshot(page, 'risk-mc-provenance');
    await page.locator('section[aria-labelledby="mc-title"]').screenshot({ path: path.resolve('test-results/screens/risk-mc-provenance-panel.png') });
  }, 300_000);

  it('after a reload the form holds the run\'s settings, and says so when they are changed', async () => {
    const before = (await provenance().textContent()) ?? '';
    await reload();
    await settled('the proposal');
    await provenance().waitFor();
    expect(await provenance().textContent()).toBe(before);
    expect(await page.getByLabel('Iterations', { exact: true }).inputValue()).toBe('300');
    expect(await page.getByLabel('Seed', { exact: true }).inputValue()).toBe('4321');
    expect(await page.getByLabel('Distribution of Discount rate', { exact: true }).inputValue()).toBe('uniform');
    expect(await page.getByLabel('Distribution of Fuel price', { exact: true }).inputValue()).toBe('triangular');
    expect(await page.getByLabel('Sample engine failures (Weibull)').isChecked()).toBe(true);
    expect(await page.getByLabel('Measure', { exact: true }).inputValue()).toBe('proposal');
    expect(await page.getByTestId('mc-changed').count()).toBe(0);

    await page.getByLabel('Seed', { exact: true }).fill('5');
    await page.getByTestId('mc-changed').waitFor();
    expect(await text('mc-changed')).toContain('the figures below are this run’s');
    await page.getByRole('button', { name: 'put this run’s settings back' }).click();
    await page.waitForFunction(() => !document.querySelector('[data-testid="mc-changed"]'));
    expect(await page.getByLabel('Seed', { exact: true }).inputValue()).toBe('4321');
  }, 300_000);

  it('pins the run: the panel, the runs list and the page header show it pinned', async () => {
    await page.getByRole('button', { name: 'Pin this run to the case' }).click();
    await page.getByTestId('mc-pinned-badge').waitFor();
    await page.waitForFunction(() => /Pinned Monte Carlo run/.test(document.querySelector('[data-testid="risk-pinned"]')?.textContent ?? ''));
    const header = await text('risk-pinned');
    expect(header).toContain(`by ${analystName}, 300 iterations, seed 4321, failures sampled, 2 drivers drawn`);
    expect(header).toMatch(/ΔNPV of the proposal against rebuilding every engine: chance of a loss \d+(\.\d)? %, P10 \/ P50 \/ P90 .+ USD M\./);
    expect(await page.getByTestId('mc-runs').locator('tbody tr').first().textContent()).toContain('· pinned');
    await page.getByRole('button', { name: 'Unpin this run' }).waitFor();
    await page.getByRole('heading', { level: 1 }).scrollIntoViewIfNeeded();
    await screenshot(page, 'risk-mc-pinned-header');
  }, 300_000);

  it('a comparison run cannot be pinned; opening the pinned run from the list restores its settings and measure', async () => {
    await page.getByLabel('Measure', { exact: true }).selectOption('fleet-delta');
    await settled('the repower');
    await page.getByLabel('Seed', { exact: true }).fill('99');
    await page.getByLabel('Iterations', { exact: true }).fill('200');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await finished('200');
    expect(await text('mc-prov-measure')).toBe('Comparison: ΔNPV of repowering every truck against rebuilding every engine');
    expect(await text('mc-prov-seed')).toBe('99');
    expect(await text('mc-pin')).toContain('Only a finished run read on the ΔNPV of the proposal');
    expect(await page.getByTestId('mc-pinned-badge').count()).toBe(0);

    const rows = page.getByTestId('mc-runs').locator('tbody tr');
    expect(await rows.count()).toBe(2);
    await rows.nth(1).getByRole('button').click();
    await page.getByTestId('mc-pinned-badge').waitFor();
    await settled('the proposal');
    expect(await text('mc-prov-seed')).toBe('4321');
    expect(await page.getByLabel('Seed', { exact: true }).inputValue()).toBe('4321');
    expect(await page.getByLabel('Iterations', { exact: true }).inputValue()).toBe('300');
    expect(await page.getByLabel('Measure', { exact: true }).inputValue()).toBe('proposal');
    expect(await page.getByTestId('mc-changed').count()).toBe(0);
  }, 300_000);

  it('after a reload the latest run (the comparison) is shown with its own settings in the form', async () => {
    await reload();
    await provenance().waitFor({ timeout: 180_000 });
    expect(await text('mc-prov-seed')).toBe('99');
    expect(await page.getByLabel('Seed', { exact: true }).inputValue()).toBe('99');
    await page.waitForFunction(() => (document.querySelector('select[aria-label="Measure"]') as HTMLSelectElement | null)?.value === 'fleet-delta');
    await settled('the repower');
    expect(await page.getByTestId('mc-changed').count()).toBe(0);
    await signOut(page);
  }, 300_000);

  it('a viewer reads the pinned run in the header and cannot pin', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/risk`, { timeout: 180_000 });
    expect(await text('risk-pinned')).toContain('seed 4321');
    await settled('the repower');
    await provenance().waitFor();
    expect(await page.getByRole('button', { name: /Pin this run|Unpin this run/ }).count()).toBe(0);
    await signOut(page);
  }, 300_000);
});
