/**
 * Issue 15, recommended overhaul life: an analyst reads an engine type's
 * recommended life in the engine library, sees its cost-rate chart, adopts the
 * life in a case and reads on the case page that the case overrides it.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { defaultAssumptionSet, dutyOfEngine, recommendOverhaulLife } from '@/lib/fleet/overhaul-life';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

const num = (s: string) => Number(s.replace(/[^\d.]/g, ''));

describe('recommended overhaul life in the engine library, adopted in a case', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseUrl = '';
  let recommended = 0;

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  const apiGet = async (path: string) => (await context.request.get(`${baseURL}/api/workspaces/${WS}/${path}`)).json();

  it('an analyst reads the recommended life of an engine type and sees its cost-rate curve', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    // a draft case to adopt the life in, made as a person makes one
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('button', { name: 'New case' }).first().click();
    await page.getByLabel('Name', { exact: true }).fill('Overhaul life trial');
    await page.getByRole('button', { name: 'Create case' }).click();
    await page.waitForURL(/\/cases\/\d+$/);
    caseUrl = page.url();
    await page.getByTestId('truck-table').waitFor();
    expect(await page.getByTestId('case-engine-lives').count()).toBe(0);

    await page.goto(`${baseURL}/${WS}/engines`);
    await page.getByTestId('engine-table').waitFor();
    await page.getByRole('button', { name: 'Recommended overhaul life of ac-2600-legacy' }).click();
    const panel = page.getByTestId('overhaul-life-panel');
    await panel.getByRole('heading', { name: 'Recommended overhaul life: ac-2600-legacy' }).waitFor();
    await panel.getByTestId('recommended-life').filter({ hasText: / h$/ }).waitFor();
    expect(await panel.getByLabel('Margin from assumption set').locator('option:checked').textContent()).toBe('Base');

    // the figure is the age-replacement optimum on the fitted trucks' mean duty and the Base set's margin
    const engine = (await apiGet('engines')).items.find((e: { key: string }) => e.key === 'ac-2600-legacy');
    const trucks = (await apiGet('trucks')).items;
    const offers = (await apiGet('offers')).items;
    const base = defaultAssumptionSet((await apiGet('assumption-sets')).items as { name: string; assumptions: { marginPerTonne: number; lostMarginShare?: number } }[])!;
    const duty = dutyOfEngine(engine.id, trucks, offers);
    const expected = recommendOverhaulLife(engine, duty, base.assumptions);
    recommended = num((await panel.getByTestId('recommended-life').textContent()) ?? '');
    expect(recommended).toBe(Math.round(expected.optimumHours!));
    expect(recommended).toBeGreaterThan(engine.lifeHours);
    const optimumRate = num((await panel.getByTestId('cost-at-optimum').textContent()) ?? '');
    const currentRate = num((await panel.getByTestId('cost-at-current').textContent()) ?? '');
    const runToFailure = num((await panel.getByTestId('cost-run-to-failure').textContent()) ?? '');
    expect(optimumRate).toBeCloseTo(expected.optimumCostPerHour, 2);
    expect(optimumRate).toBeLessThan(currentRate);
    expect(optimumRate).toBeLessThan(runToFailure);
    expect(await panel.getByText('At the current planned life (20,000 h)').count()).toBe(1);

    // the duty says which trucks and that it is their mean; the note says what kind of rate it is
    const dutyText = (await panel.getByTestId('overhaul-life-duty').textContent()) ?? '';
    expect(dutyText).toContain(`the mean duty of the ${duty.trucks.length} trucks fitted with it (${duty.trucks.slice(0, 3).join(', ')}`);
    expect(await panel.getByText(/steady-state, undiscounted rate at year-1 prices/).count()).toBe(1);

    // the chart: the curve, the current life and the optimum marked; and the table beside it
    const chart = panel.getByTestId('cost-rate-chart');
    await chart.locator('svg path').first().waitFor();
    expect(await chart.getByTestId('mark-current').count()).toBe(1);
    expect(await chart.getByTestId('mark-optimum').count()).toBe(1);
    expect(await chart.getByText(`recommended ${recommended.toLocaleString('en-US')} h`).count()).toBe(1);
    const rows = panel.getByTestId('cost-rate-table').locator('tbody tr');
    expect(await rows.count()).toBeGreaterThanOrEqual(5);
    expect(await rows.filter({ hasText: 'current planned life' }).locator('td').first().textContent()).toBe('20,000');
    expect(await rows.filter({ hasText: 'recommended' }).locator('td').first().textContent()).toBe(recommended.toLocaleString('en-US'));
    await screenshot(page, 'overhaul-life-panel');
  });

  it('adopts the recommended life in the case, and the case page says which engine life it overrides', async () => {
    const panel = page.getByTestId('overhaul-life-panel');
    const caseId = caseUrl.split('/').pop();
    await panel.getByLabel('Case', { exact: true }).selectOption({ value: caseId });
    const before = (await apiGet(`cases/${caseId}/result`)).result.trucks as { id: string; options: { rebuild: { npv: number } } }[];
    await panel.getByRole('button', { name: `Use ${recommended.toLocaleString('en-US')} h in case` }).click();
    const status = panel.getByTestId('adopt-life-status');
    await status.getByText(/now plans ac-2600-legacy overhauls at/).waitFor();
    expect(await status.textContent()).toContain(`Case Overhaul life trial now plans ac-2600-legacy overhauls at ${recommended.toLocaleString('en-US')} h.`);
    await status.getByRole('link', { name: 'Open the case' }).click();
    await page.waitForURL(caseUrl);

    const lives = page.getByTestId('case-engine-lives');
    await lives.getByText('(library 20,000 h)').waitFor();
    expect((await lives.getByTestId('engine-life-override').textContent())?.replace(/\s+/g, ' ')).toContain(`ac-2600-legacy: planned life ${recommended.toLocaleString('en-US')} h (library 20,000 h)`);
    await page.getByTestId('truck-table').waitFor();
    await screenshot(page, 'overhaul-life-case');
    // the case's figures now read the adopted life: rebuild of a truck with that engine moves
    const after = (await apiGet(`cases/${caseId}/result`)).result.trucks as typeof before;
    const fitted = (await apiGet('trucks')).items.find((t: { engineKey: string }) => t.engineKey === 'ac-2600-legacy').unitNumber;
    const npv = (list: typeof before) => list.find((t) => t.id === fitted)!.options.rebuild.npv;
    expect(Math.abs(npv(after) - npv(before))).toBeGreaterThan(1000);

    // back to the library's life from the case page
    await lives.getByRole('button', { name: "Use the library's life for ac-2600-legacy" }).click();
    await lives.waitFor({ state: 'detached' });
    expect((await apiGet(`cases/${caseId}`)).case.engineLives).toEqual({});
  });

  it('a viewer reads the recommendation but cannot adopt it', async () => {
    await signOut(page);
    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/engines`);
    await page.getByRole('button', { name: 'Recommended overhaul life of ac-2600-legacy' }).click();
    const panel = page.getByTestId('overhaul-life-panel');
    await panel.getByTestId('recommended-life').filter({ hasText: / h$/ }).waitFor();
    expect(num((await panel.getByTestId('recommended-life').textContent()) ?? '')).toBe(recommended);
    expect(await panel.getByTestId('adopt-life').count()).toBe(0);
  });
});
