import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest';
import type { Page } from 'playwright-core';
import { hashPassword } from '@/lib/auth/password';
import { createKnex } from '@/lib/db/connection';
import { DEMO_PASSWORD, openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('password reset by e-mail and the audit log', () => {
  let page: Page;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, baseURL, close } = await openBrowser());
  });
  afterAll(async () => {
    await close();
    // Other browser files sign in as the viewer with the demo password: put it back.
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    await k('users').where({ email: 'viewer@aldervane.test' }).update({ passwordHash: await hashPassword(DEMO_PASSWORD) });
    await k.destroy();
  });

  it('resets a password through the mailed link, once', async () => {
    await page.goto(`${baseURL}/sign-in`);
    await page.getByRole('link', { name: 'Forgot your password?' }).click();
    await page.waitForURL(`${baseURL}/forgot-password`);
    await page.getByLabel('Email').fill('viewer@aldervane.test');
    await page.getByRole('button', { name: 'Mail me a reset link' }).click();
    expect(await page.getByTestId('forgot-done').textContent()).toMatch(/If an account uses that address/);

    // The admin sees on the Outbox page that the mail went out, but not its link (it is the viewer's alone).
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/outbox`);
    const item = page.getByTestId('outbox').locator('li').filter({ hasText: 'Reset your Haulcase password' }).first();
    expect(await item.textContent()).toContain('to viewer@aldervane.test');
    await item.locator('summary').click();
    expect(await item.textContent()).toContain('its content is not shown here');
    expect(await item.getByRole('link').filter({ hasText: '/reset-password/' }).count()).toBe(0);
    await signOut(page);
    // The viewer reads it in their own mailbox: here, the sink's stored copy.
    const k = createKnex({ ...process.env, HAULCASE_DATA_DIR: inject('e2eDataDir'), DATABASE_URL: '' });
    const mail = await k('mail_sink').where('subject', 'Reset your Haulcase password').orderBy('id', 'desc').first();
    await k.destroy();
    expect(JSON.parse(mail.toAddresses)).toEqual(['viewer@aldervane.test']);
    const link = (mail.text as string).match(/https?:\/\/\S+\/reset-password\/\S+/)?.[0] as string;
    expect(link).toBeTruthy();

    await page.goto(link);
    await page.getByLabel('New password', { exact: true }).fill('short');
    await page.getByLabel('Repeat the new password').fill('short');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    expect(await page.getByTestId('reset-error').textContent()).toBe('Use at least 10 characters.');
    await page.getByLabel('New password', { exact: true }).fill('haul-road-grade-8pc');
    await page.getByLabel('Repeat the new password').fill('haul-road-grade-8pc');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.getByText('Your password is changed.').waitFor();
    await signIn(page, baseURL, 'viewer@aldervane.test', 'haul-road-grade-8pc');
    expect(await page.getByTestId('current-role').textContent()).toBe('Viewer');
    await signOut(page);

    await page.goto(link);
    await page.getByLabel('New password', { exact: true }).fill('another-password-9');
    await page.getByLabel('Repeat the new password').fill('another-password-9');
    await page.getByRole('button', { name: 'Set the new password' }).click();
    await page.getByTestId('reset-error').getByText(/already been used/).waitFor();
  });

  it('lists changes with before → after, filters by kind and person, and downloads CSV', async () => {
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/members`);
    await page.getByLabel('Email').fill('site.manager@aldervane.test');
    await page.getByLabel('Role').selectOption('viewer');
    await page.getByRole('button', { name: 'Send invitation' }).click();
    await page.getByText('Invitation sent to site.manager@aldervane.test.').waitFor();

    await page.goto(`${baseURL}/${WS}/audit`);
    await page.getByLabel('Kind').selectOption('invitation:invite');
    await page.getByLabel('Person').selectOption({ label: 'admin@aldervane.test' });
    await page.getByRole('button', { name: 'Filter' }).click();
    await page.waitForURL((u) => u.searchParams.get('kind') === 'invitation:invite');
    const rows = page.getByTestId('audit-table').locator(':scope > tbody > tr');
    const texts = await rows.allTextContents();
    expect(texts.length).toBeGreaterThanOrEqual(1);
    for (const t of texts) expect(t).toContain('invite');
    expect(texts.some((t) => t.includes('site.manager@aldervane.test'))).toBe(true);
    expect(await page.getByTestId('audit-diff').first().textContent()).toContain('Role');
    await screenshot(page, 'audit-log-filtered');

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: 'Download CSV' }).click()]);
    const csv = fs.readFileSync((await download.path()) as string, 'utf8');
    const lines = csv.trim().split('\r\n');
    expect(lines[0]).toBe('id,at (UTC),who,change,what,action,entity,entity id,before,after');
    expect(lines.length).toBe(texts.length + 1);
    expect(csv).toContain('site.manager@aldervane.test');

    await page.goto(`${baseURL}/${WS}/audit?from=2027-02-01&to=2027-01-01`);
    expect(await page.getByTestId('audit-filter-error').textContent()).toContain('The end date is before the start date.');
    await signOut(page);
  });
});
