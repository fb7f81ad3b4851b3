import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { apiHeaders, openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

const NAME = 'Overview check — T2 trucks';

describe('the overview by role', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;
  let caseId: number;

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => {
    await close();
    // take the case out again, so other browser files count the demo's cases as seeded
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await k('business_cases').where({ name: NAME }).delete();
    await k.destroy();
  });

  const titleMatchesList = async (panel: string, list: string, words: (n: number) => string) => {
    const n = await page.getByTestId(list).locator('li').count();
    expect(await page.getByTestId(`${panel}-title`).textContent()).toBe(words(n));
    return n;
  };

  it('an approver sees the case waiting for them, linked; after sending it back the analyst sees it sent back; a viewer sees approved cases', async () => {
    await signIn(page, baseURL, 'analyst@aldervane.test');
    const options = await (await context.request.get(`${baseURL}/api/workspaces/${WS}/cases/options`)).json();
    const base = options.assumptionSets.find((s: { name: string }) => s.name === 'Base');
    const t2 = options.trucks.filter((t: { unitNumber: string }) => t.unitNumber.startsWith('T2-'));
    const created = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases`, {
      headers: apiHeaders(baseURL),
      data: { name: NAME, assumptionSetId: base.id, selection: t2.map((t: { id: number }) => ({ truckId: t.id, repowerOfferId: null })) },
    });
    expect(created.status()).toBe(201);
    const c = (await created.json()).case;
    caseId = c.id;
    await page.goto(`${baseURL}/${WS}`);
    // the analyst's own drafts: the seeded demo case and this one
    const drafts = page.getByTestId('drafts-list');
    expect(await drafts.getByRole('link', { name: NAME }).count()).toBe(1);
    expect(await drafts.getByRole('link', { name: 'North Pit fleet — base assumptions' }).count()).toBe(1);
    expect(await page.getByTestId('waiting-for-you').count()).toBe(0);
    const submitted = await context.request.post(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/submit`, { headers: apiHeaders(baseURL), data: { comment: 'T2 trucks only', version: c.version } });
    expect(submitted.status()).toBe(200);
    await signOut(page);

    await signIn(page, baseURL, 'approver@aldervane.test');
    await page.goto(`${baseURL}/${WS}`);
    const n = await titleMatchesList('waiting-for-you', 'waiting-list', (k) => `${k} case${k === 1 ? '' : 's'} waiting for you`);
    expect(n).toBeGreaterThanOrEqual(1);
    expect(await page.getByTestId('your-drafts').count()).toBe(0);
    await screenshot(page, 'overview-approver');
    await page.getByTestId('waiting-list').getByRole('link', { name: NAME }).click();
    await page.waitForURL(`${baseURL}/${WS}/approvals/${caseId}`);
    const panel = page.getByTestId('approval-panel');
    await panel.getByLabel(/Comment/).fill('Add the T3 trucks due next year.');
    await panel.getByRole('button', { name: 'Send back' }).click();
    await panel.getByText('Sent back to the analyst.').waitFor();
    await page.goto(`${baseURL}/${WS}`);
    expect(await page.getByTestId('waiting-list').getByRole('link', { name: NAME }).count()).toBe(0);
    await signOut(page);

    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}`);
    await titleMatchesList('returned-to-you', 'returned-list', (k) => `${k} case${k === 1 ? '' : 's'} sent back for changes`);
    await page.getByTestId('returned-list').getByRole('link', { name: NAME }).click();
    await page.waitForURL(`${baseURL}/${WS}/cases/${caseId}`);
    await screenshot(page, 'overview-analyst-followed');
    await signOut(page);

    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}`);
    const approved = page.getByTestId('approved-cases');
    const count = await page.getByTestId('approved-list').locator('li').count();
    expect(await approved.getByTestId('approved-cases-title').textContent()).toBe(count === 0 ? 'No case approved yet' : `${count} approved case${count === 1 ? '' : 's'}`);
    expect(await page.getByTestId('waiting-for-you').count()).toBe(0);
    expect(await page.getByTestId('your-drafts').count()).toBe(0);
    await signOut(page);

    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}`);
    await page.getByTestId('waiting-for-you').waitFor();
    await page.getByTestId('returned-list').getByRole('link', { name: NAME }).waitFor();
    const hints = await page.getByTestId('admin-hints').textContent();
    expect(hints).toMatch(/\d+ members, 1 admin/);
    await screenshot(page, 'overview-admin');
    await signOut(page);
  });
});
