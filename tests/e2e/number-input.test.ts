/**
 * One number rule for forms and imports: in a workspace that writes decimals
 * with a point, "8,50" in the truck form is refused with a plain message on
 * its field, "abc" too, and "18,950" is saved as 18950.
 */
import type { Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import { createKnex } from '@/lib/db/connection';
import { WS, openBrowser, screenshot, signIn, signOut } from './support/browser';

const UNIT = 'T3-14';

describe('typing numbers in the truck form', () => {
  let b: Awaited<ReturnType<typeof openBrowser>>;
  let k: Knex;
  let before: { engineHours: number; loadFactor: number };

  beforeAll(async () => {
    b = await openBrowser();
    k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    before = await k('trucks').where({ workspaceId: ws.id, unitNumber: UNIT }).first('engineHours', 'loadFactor');
  });
  afterAll(async () => {
    // put the demo truck back as it was for other browser files
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    await k('trucks').where({ workspaceId: ws.id, unitNumber: UNIT }).update(before);
    await k.destroy();
    await b?.close();
  });

  it('explains a decimal comma and garbage per field, and saves grouped thousands', async () => {
    const { page, baseURL } = b;
    await signIn(page, baseURL, 'analyst@aldervane.test');
    await page.goto(`${baseURL}/${WS}/fleet`);
    await page.getByRole('button', { name: `Edit ${UNIT}` }).click();
    const form = page.getByTestId('truck-form');
    await form.getByLabel('Engine hours (h)').fill('8,50');
    await form.getByLabel('Load factor (0–1)').fill('abc');
    await form.getByRole('button', { name: 'Save truck' }).click();
    await form.getByText('Engine hours: enter a number such as 8.5 (this workspace writes decimals with a point)').waitFor();
    // the example is the field's own value
    await form.getByText(`Load factor: enter a number such as ${before.loadFactor}`).waitFor();
    expect(await form.getByText(/expected number|NaN/).count()).toBe(0);
    await screenshot(page, 'number-input-errors');

    await form.getByLabel('Load factor (0–1)').fill('0.5');
    await form.getByLabel('Engine hours (h)').fill('18,950');
    await form.getByRole('button', { name: 'Save truck' }).click();
    await form.waitFor({ state: 'detached' });
    await page.locator(`tr[data-unit="${UNIT}"]`).getByText('18,950').waitFor();
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    expect(await k('trucks').where({ workspaceId: ws.id, unitNumber: UNIT }).first('engineHours', 'loadFactor')).toEqual({ engineHours: 18950, loadFactor: 0.5 });
    await signOut(page);
  });

  it('after an admin picks the decimal comma, the form shows 0,5 and takes 18.950,5', async () => {
    const { page, baseURL } = b;
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/settings`);
    await page.getByLabel('18.950,5 (decimal comma)').check();
    await page.getByRole('button', { name: 'Save display settings' }).click();
    await page.getByText('Saved.').waitFor();
    try {
      await page.goto(`${baseURL}/${WS}/fleet`);
      await page.getByRole('button', { name: `Edit ${UNIT}` }).click();
      const form = page.getByTestId('truck-form');
      expect(await form.getByLabel('Load factor (0–1)').inputValue()).toBe('0,5');
      await form.getByLabel('Engine hours (h)').fill('18.950,5');
      await form.getByRole('button', { name: 'Save truck' }).click();
      await form.waitFor({ state: 'detached' });
      const ws = await k('workspaces').where({ slug: WS }).first('id');
      expect((await k('trucks').where({ workspaceId: ws.id, unitNumber: UNIT }).first('engineHours')).engineHours).toBe(18950.5);
    } finally {
      await page.goto(`${baseURL}/${WS}/settings`);
      await page.getByLabel('18,950.5 (decimal point)').check();
      await page.getByRole('button', { name: 'Save display settings' }).click();
      await page.getByText('Saved.').waitFor();
      await signOut(page);
    }
  });
});
