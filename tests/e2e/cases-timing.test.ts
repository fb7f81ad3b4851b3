import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Knex } from 'knex';
import type { BrowserContext, Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { openBrowser, signIn, signOut, WS, apiHeaders } from './support/browser';
import { createSyntheticWorkspace } from './support/synthetic-fleet';

const SYNTH = 'synthetic-two-hundred';

/** Measures (prints, never asserts on) evaluate-and-render time for the demo case and a 200-truck fleet. */
describe('time to evaluate and render a case', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let k: Knex;

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await createSyntheticWorkspace(k, SYNTH, 200, 'analyst@aldervane.test');
  });
  afterAll(async () => {
    await k('workspaces').where({ slug: SYNTH }).delete();
    await k.destroy();
    await close();
  });

  async function measure(slug: string): Promise<void> {
    const opts = await (await context.request.get(`${baseURL}/api/workspaces/${slug}/cases/options`)).json();
    const trucks: number = opts.trucks.length;
    const base = opts.assumptionSets.find((s: { name: string }) => s.name === 'Base');
    const created = await context.request.post(`${baseURL}/api/workspaces/${slug}/cases`, {
      headers: apiHeaders(baseURL),
      data: { name: `Timing ${trucks}`, assumptionSetId: base.id, selection: opts.trucks.map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null })) },
    });
    expect(created.status()).toBe(201);
    const id = (await created.json()).case.id;
    const runs: number[] = [];
    let server = 0;
    for (let i = 0; i < 3; i++) {
      const t0 = Date.now();
      await page.goto(`${baseURL}/${slug}/cases/${id}`);
      await page.getByTestId('truck-table').locator(`tbody tr >> nth=${trucks - 1}`).waitFor();
      runs.push(Date.now() - t0);
    }
    // the server's own figure is in the API answer, not on the page
    server = (await (await context.request.get(`${baseURL}/api/workspaces/${slug}/cases/${id}/result`)).json()).evaluatedMs;
    expect(await page.getByTestId('truck-table').locator('tbody tr').count()).toBe(trucks);
    console.log(`[timing] ${trucks} trucks: page load + server evaluation + render ${runs.join(', ')} ms (server evaluation ${server} ms on a further request)`);
  }

  it('the demo case (24 trucks, plus any other browser tests added)', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await measure(WS);
  });

  it('a 200-truck synthetic fleet', async () => {
    await measure(SYNTH);
    await signOut(page);
  });
});
