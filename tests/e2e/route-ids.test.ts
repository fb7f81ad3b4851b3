import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Knex } from 'knex';
import type { Page } from 'playwright-core';
import { createKnex } from '@/lib/db/connection';
import { openBrowser, signIn, WS } from './support/browser';

/**
 * Ids in URLs follow one rule (lib/http.ts idParam): "0x10", "05" or "1e1" name
 * no case, on every page alike. Before, the risk and approval pages read "0x5"
 * as case 5 and the truck page read "05" as case 5.
 */
describe('ids in page URLs', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;
  let k: Knex;
  let caseId = 0;
  let unit = '';
  const name = 'Ids in URLs check';

  const heading = () => page.getByRole('heading', { level: 1 }).textContent();

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    const truck = await k('trucks').where({ workspaceId: ws.id }).orderBy('unitNumber').first('id', 'unitNumber');
    unit = truck.unitNumber;
    const set = await k('assumption_sets').where({ workspaceId: ws.id, name: 'Base' }).first('id');
    const now = new Date().toISOString();
    const [row] = await k('business_cases')
      .insert({
        workspaceId: ws.id, name, assumptionSetId: set.id, selection: JSON.stringify([{ truckId: truck.id, repowerOfferId: null }]),
        plan: JSON.stringify({ budgets: {}, swapsPerMonth: 2, startMonth: '2027-01' }), status: 'draft', version: 1, createdAt: now, updatedAt: now,
      })
      .returning('id');
    caseId = typeof row === 'object' ? row.id : row;
    await signIn(page, baseURL, 'viewer@aldervane.test');
  });
  afterAll(async () => {
    await close();
    await k('business_cases').where({ id: caseId }).delete();
    await k.destroy();
  });

  it('opens the case from the list, and its risk, truck and approval pages by its plain id', async () => {
    await page.goto(`${baseURL}/${WS}/cases`);
    await page.getByRole('link', { name, exact: true }).click();
    await page.waitForURL(`${baseURL}/${WS}/cases/${caseId}`);
    expect(await heading()).toBe(name);
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/risk`);
    expect(await heading()).toBe(`Sensitivity and risk — ${name}`);
    await page.goto(`${baseURL}/${WS}/cases/${caseId}/trucks/${encodeURIComponent(unit)}`);
    expect(await heading()).toBe(`Truck ${unit}`);
    await page.goto(`${baseURL}/${WS}/approvals/${caseId}`);
    expect(await heading()).toBe(name);
  });

  it('shows the not-found page for /cases/0x10, and for the same case written in hex, with a leading zero or as an exponent', async () => {
    const hex = `0x${caseId.toString(16)}`;
    for (const path of [
      `cases/0x10`,
      `cases/${hex}`,
      `cases/${hex}/risk`,
      `cases/${caseId}e0/risk`,
      `cases/0${caseId}/trucks/${encodeURIComponent(unit)}`,
      `cases/${hex}/trucks/${encodeURIComponent(unit)}`,
      `cases/${caseId}/trucks/${encodeURIComponent('T1\n')}`,
      `cases/0${caseId}/plan`,
      `approvals/${hex}`,
    ]) {
      await page.goto(`${baseURL}/${WS}/${path}`);
      expect(await heading(), path).toBe('Not found');
      expect(await page.getByText('This page does not exist, or it belongs to a workspace you are not a member of.').isVisible(), path).toBe(true);
    }
  });

  it('the API answers 404 { error: "Not found." } for the same ids', async () => {
    for (const path of [`cases/0x10/drivers`, `cases/0${caseId}/history`, `cases/${caseId}e0/result`]) {
      const r = await page.context().request.get(`${baseURL}/api/workspaces/${WS}/${path}`);
      expect(r.status(), path).toBe(404);
      expect(await r.json(), path).toEqual({ error: 'Not found.' });
    }
  });
});
