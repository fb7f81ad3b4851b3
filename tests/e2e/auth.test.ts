import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { openBrowser, screenshot, signIn, signOut, WS } from './support/browser';

describe('sign-in, roles and the app shell', () => {
  let page: Page;
  let context: BrowserContext;
  let baseURL: string;
  let close: () => Promise<void>;

  beforeAll(async () => {
    ({ page, context, baseURL, close } = await openBrowser());
  });
  afterAll(async () => close());

  it.each(['admin', 'analyst', 'approver', 'viewer'])('signs in as the demo %s and sees the shell with that role', async (role) => {
    await signIn(page, baseURL, `${role}@aldervane.test`);
    await page.waitForURL(`${baseURL}/${WS}`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toContain('Aldervane Copper');
    expect(await page.getByTestId('current-role').textContent()).toBe(role[0].toUpperCase() + role.slice(1));
    const nav = page.getByRole('navigation', { name: 'Workspace' });
    for (const label of ['Fleet register', 'Engine library', 'Repower offers', 'Assumptions', 'Business cases', 'Approvals', 'Settings']) {
      expect(await nav.getByRole('link', { name: label }).count()).toBe(1);
    }
    expect(await nav.getByRole('link', { name: 'Members' }).count()).toBe(role === 'admin' ? 1 : 0);
    if (role === 'admin') await screenshot(page, 'shell-admin-overview');
    await signOut(page);
  });

  it('shows the admin the member list, and refuses it to a viewer', async () => {
    await signIn(page, baseURL, 'admin@aldervane.test');
    await page.goto(`${baseURL}/${WS}/members`);
    const rows = await page.getByTestId('members-table').locator('tbody tr').allTextContents();
    expect(rows.some((r) => r.includes('viewer@aldervane.test') && r.includes('Viewer'))).toBe(true);
    await signOut(page);

    await signIn(page, baseURL, 'viewer@aldervane.test');
    await page.goto(`${baseURL}/${WS}/members`);
    expect(await page.getByTestId('access-denied').textContent()).toMatch(/needs the Admin role/);
    expect(await page.getByTestId('members-table').count()).toBe(0);
    await signOut(page);
  });

  it('sends a signed-out visit to sign-in and returns to the page afterwards', async () => {
    await page.goto(`${baseURL}/${WS}/engines`);
    await page.waitForURL((u) => u.pathname === '/sign-in');
    expect(new URL(page.url()).searchParams.get('callbackUrl')).toBe(`/${WS}/engines`);
    await page.getByLabel('Email').fill('analyst@aldervane.test');
    await page.getByLabel('Password').fill('haulcase-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.waitForURL(`${baseURL}/${WS}/engines`);
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Engine library');
    await signOut(page);
  });

  it('says clearly when the password is wrong, and stays on sign-in', async () => {
    await page.goto(`${baseURL}/sign-in`);
    await page.getByLabel('Email').fill('approver@aldervane.test');
    await page.getByLabel('Password').fill('not-the-password');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('Wrong email or password').waitFor();
    expect(new URL(page.url()).pathname).toBe('/sign-in');
    await screenshot(page, 'sign-in-wrong-password');
  });

  it('signs out: app pages then need signing in again', async () => {
    await signIn(page, baseURL, 'approver@aldervane.test');
    await signOut(page);
    await page.goto(`${baseURL}/${WS}`);
    await page.waitForURL((u) => u.pathname === '/sign-in');
    const r = await context.request.get(`${baseURL}/api/workspaces/${WS}`);
    expect(r.status()).toBe(401);
  });

  it('answers 403 to an API request for another workspace', async () => {
    await signIn(page, baseURL, 'viewer@aldervane.test');
    const own = await context.request.get(`${baseURL}/api/workspaces/${WS}`);
    expect(own.status()).toBe(200);
    const other = await context.request.get(`${baseURL}/api/workspaces/corrin-flats`);
    expect(other.status()).toBe(403);
    expect((await other.json()).error).toMatch(/not a member/);
    await signOut(page);
  });

  it('throttles repeated failed sign-ins with a clear message (429)', async () => {
    for (let i = 0; i < 5; i++) {
      await page.goto(`${baseURL}/sign-in`);
      await page.getByLabel('Email').fill('admin@corrin.test');
      await page.getByLabel('Password').fill(`wrong-${i}`);
      await page.getByRole('button', { name: 'Sign in' }).click();
      await page.getByText('Wrong email or password').waitFor();
    }
    const statuses: number[] = [];
    page.on('response', (r) => {
      if (r.url().includes('/api/auth/callback/credentials')) statuses.push(r.status());
    });
    await page.getByLabel('Password').fill('haulcase-demo');
    await page.getByRole('button', { name: 'Sign in' }).click();
    await page.getByText('Too many failed sign-ins').waitFor();
    expect(statuses).toContain(429);
    expect(new URL(page.url()).pathname).toBe('/sign-in');
  });

  it('sends security headers', async () => {
    const r = await context.request.get(`${baseURL}/sign-in`);
    const h = r.headers();
    expect(h['x-frame-options']).toBe('DENY');
    expect(h['x-content-type-options']).toBe('nosniff');
    expect(h['referrer-policy']).toBe('strict-origin-when-cross-origin');
    expect(h['content-security-policy']).toContain("frame-ancestors 'none'");
  });
});
