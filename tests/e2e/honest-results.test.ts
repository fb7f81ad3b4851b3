import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

// The demo case's figures come from the invented demo data; which trucks' paybacks fall back below zero was
// worked from the definition in lib/cases/payback.ts on the cumulative Δ cash flows the truck page charts.
describe('honest results: flagged paybacks, fuel axis from zero, the fleet by year, the mail base warning', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseUrl: string;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it('an analyst reads a flagged payback in the results table and on the truck page', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name: 'North Pit fleet — base assumptions' }).first().click();
    await page.waitForURL(/\/cases\/\d+$/);
    caseUrl = page.url();
    const table = page.getByTestId('truck-table');
    await table.waitFor();
    const flagged = table.getByTestId('payback-flagged');
    expect(await flagged.count()).toBeGreaterThan(0);
    expect(await flagged.first().textContent()).toMatch(/^\d+\.\d does not hold$/);
    expect(await flagged.first().getAttribute('title')).toMatch(/^Pays back in year \d+\.\d but falls below zero again in years? \d/);
    // a figure that shows as 0 is never in the negative style
    const zeroRed = await table.getByTestId('signed').evaluateAll((cells) => cells.filter((c) => /^\(?0\)?$/.test((c.textContent ?? '').trim()) && c.classList.contains('text-loss')).length);
    expect(zeroRed).toBe(0);

    // the fleet chart over the years, from zero
    const fleet = page.getByTestId('chart-fleet-years');
    await fleet.locator('svg').first().waitFor();
    await page.getByRole('group', { name: 'Fleet figure' }).getByRole('button', { name: 'Fuel' }).click();
    expect(await fleet.locator('figcaption').textContent()).toMatch(/^Fleet by year: fuel \(kL\), best mix against rebuilding every engine/);
    expect(await lowestTick(fleet)).toBe('0');
    await screenshot(page, 'honest-results-case');

    await table.getByRole('link', { name: 'T3-10' }).click();
    await page.waitForURL(/\/trucks\/T3-10$/);
    const warning = page.getByTestId('payback-warning');
    await warning.waitFor();
    expect(await warning.textContent()).toMatch(/^Pays back in year \d+\.\d but falls below zero again in years? [\d–, and]+ \(discounted\): the payback does not hold\.$/);
    // the chart draws its shading once it has measured its width: wait for it rather than count at once
    await page.getByTestId('payback-dip').first().waitFor();
    expect(await page.getByTestId('payback-dip').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('truck-discounted-payback').textContent()).toMatch(/does not hold/);
    expect(await page.getByTestId('truck-payback-warning').textContent()).toMatch(/the payback does not hold/);

    // the fuel axis starts at zero
    const fuel = page.getByTestId('chart-fuel');
    await fuel.locator('svg').first().waitFor();
    expect(await lowestTick(fuel)).toBe('0');
    expect(await fuel.getByLabel('Legend').textContent()).toMatch(/Keep \(dashed, drawn on top\)/);
    await page.getByTestId('cash-flow-table').scrollIntoViewIfNeeded();
    await screenshot(page, 'honest-results-truck');
    await signOut(page);
  });

  it('choosing a 2,000 kW module for a truck with a 2,600 kW engine warns in the register form', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.getByRole('button', { name: 'Edit T3-01' }).click();
    const form = page.getByTestId('truck-form');
    await form.waitFor();
    await form.getByLabel('Repower offer').selectOption({ label: 'brannock-bd2000' });
    const w = form.getByTestId('offer-power-warning');
    await w.waitFor();
    expect(await w.textContent()).toMatch(/^The offer's engine is rated 2,000 kW, 23 % below the truck's 2,600 kW engine/);
    await form.getByLabel('Repower offer').selectOption({ label: 'kestrel-km2700' });
    await w.waitFor({ state: 'detached' });
    await form.getByLabel('Repower offer').selectOption({ label: 'brannock-bd2000' });
    await w.waitFor();
    await screenshot(page, 'honest-results-power-warning');
    await form.getByRole('button', { name: 'Cancel' }).click();
    await signOut(page);
  });

  it('an admin reads on the Outbox page that no APP_URL is set', async () => {
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/outbox`);
    const w = page.getByTestId('outbox-base-warning');
    await w.waitFor();
    expect(await w.textContent()).toMatch(/^APP_URL is not set: links in mail use the address of the request that sent them/);
    await screenshot(page, 'honest-results-outbox');
    await signOut(page);
  });
});

/** The text of the y-axis tick drawn lowest on a chart (largest y). */
async function lowestTick(figure: ReturnType<Page['getByTestId']>): Promise<string> {
  return figure.locator('svg').first().evaluate((svg) => {
    // the y-axis tick labels: numeric texts of the axes that sit left of the plot (text-anchor end)
    const ticks = Array.from(svg.querySelectorAll('.visx-axis text')) as SVGTextElement[];
    const labelled = ticks.filter((t) => /^[−\d(]/.test((t.textContent ?? '').trim()) && (t.getAttribute('text-anchor') === 'end' || getComputedStyle(t).textAnchor === 'end'));
    labelled.sort((a, b) => b.getBoundingClientRect().top - a.getBoundingClientRect().top);
    return (labelled[0]?.textContent ?? '').trim();
  });
}
