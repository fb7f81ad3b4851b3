import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Knex } from 'knex';
import type { Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { openBrowser, signIn, WS } from './support/browser';

/**
 * The truck page of a case, for unit numbers with a "%": the link encodes the
 * unit once; the page gets the segment as it is and decodes it once, the truck
 * API gets it decoded by Next and must not decode it again ("T%41" opened "TA";
 * "50%" threw, a 500). A path that cannot be decoded is a 404.
 */
describe('the truck page of a case, by unit number', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let k: Knex;
  let caseUrl = '';
  let renamed: Array<{ id: number; unitNumber: string }> = [];
  let caseId = 0;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    renamed = await k('trucks').where({ workspaceId: ws.id }).orderBy('unitNumber', 'desc').limit(2).select('id', 'unitNumber');
    await k('trucks').where({ id: renamed[0].id }).update({ unitNumber: 'T%41' });
    await k('trucks').where({ id: renamed[1].id }).update({ unitNumber: 'TA' });
    const set = await k('assumption_sets').where({ workspaceId: ws.id, name: 'Base' }).first('id');
    const now = new Date().toISOString();
    const [row] = await k('business_cases')
      .insert({
        workspaceId: ws.id, name: 'Unit numbers with a percent sign', assumptionSetId: set.id,
        selection: JSON.stringify(renamed.map((t) => ({ truckId: t.id, repowerOfferId: null }))), plan: JSON.stringify({ budgets: {}, swapsPerMonth: 2, startMonth: '2027-01' }), status: 'draft', version: 1, createdAt: now, updatedAt: now,
      })
      .returning('id');
    caseId = typeof row === 'object' ? row.id : row;
    caseUrl = `${baseURL}/${WS}/cases/${caseId}`;
    await signIn(page, baseURL, 'viewer@aldervane.test');
  });
  afterAll(async () => {
    await close();
    await k('business_cases').where({ id: caseId }).delete();
    for (const t of renamed) await k('trucks').where({ id: t.id }).update({ unitNumber: t.unitNumber });
    await k.destroy();
  });

  it('opens "T%41" from its link in the case, not the truck "TA"', async () => {
    await page.goto(caseUrl);
    const link = page.getByTestId('truck-table').getByRole('link', { name: 'T%41', exact: true });
    expect(await link.getAttribute('href')).toBe(`/${WS}/cases/${caseId}/trucks/T%2541`);
    await link.click();
    await page.waitForURL(`${caseUrl}/trucks/T%2541`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Truck T%41');
    // the figures come from the truck API for the same unit
    await page.getByTestId('npv-repower').waitFor();
    const api = await page.context().request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/trucks/T%2541`);
    expect(api.status()).toBe(200);
    expect((await api.json()).result.id).toBe('T%41');
  });

  it('answers 404, not 500, for a segment that is not valid percent-encoding; the not-found page for a unit no truck can have', async () => {
    const broken = await page.goto(`${caseUrl}/trucks/T%`);
    expect(broken?.status()).toBe(404);
    // the workspace's loading state has streamed by then, so Next shows its not-found page with a 200
    await page.goto(`${caseUrl}/trucks/${'x'.repeat(200)}`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Not found');
    const api = await page.context().request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/trucks/T%`);
    expect(api.status()).toBe(404);
    expect((await page.context().request.get(`${baseURL}/api/workspaces/${WS}/cases/${caseId}/trucks/50%25`)).status()).toBe(404);
  });
});
