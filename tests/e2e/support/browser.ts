import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { chromium, type BrowserContext, type Page } from 'playwright-core';
import { inject } from 'vitest';

export const DEMO_PASSWORD = 'haulcase-demo';
export const WS = 'aldervane-north-pit';

/** Debian's chromium, headless, with the flags this sandbox needs (no network beyond loopback). */
export async function openBrowser(): Promise<{ context: BrowserContext; page: Page; baseURL: string; close: () => Promise<void> }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-chromium-'));
  const context = await chromium.launchPersistentContext(dir, {
    executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--disable-dev-shm-usage'],
    viewport: { width: 1440, height: 900 },
    acceptDownloads: true,
  });
  context.setDefaultTimeout(20_000);
  const page = context.pages()[0] ?? (await context.newPage());
  return {
    context,
    page,
    baseURL: inject('baseURL'),
    close: async () => {
      await context.close();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** Signs in through the form, as a person would, and waits to leave the sign-in page. */
export async function signIn(page: Page, baseURL: string, email: string, password = DEMO_PASSWORD, path = '/sign-in') {
  await page.goto(`${baseURL}${path}`);
  await page.getByLabel('Email').fill(email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => !u.pathname.startsWith('/sign-in'));
}

export async function signOut(page: Page) {
  await page.getByRole('button', { name: 'Sign out' }).click();
  await page.waitForURL((u) => u.pathname.startsWith('/sign-in'));
}

/** Saves a full-page screenshot under test-results/screens for a person to look at. */
export async function screenshot(page: Page, name: string) {
  const dir = path.resolve('test-results/screens');
  fs.mkdirSync(dir, { recursive: true });
  await page.screenshot({ path: path.join(dir, `${name}.png`), fullPage: true });
}

/**
 * Headers for a state-changing API call made with Playwright's request context
 * (which sends no Origin): the app refuses writes that do not come from its own
 * origin as JSON (lib/http/origin.ts), as a page of the app would send them.
 */
export const apiHeaders = (baseURL: string) => ({ origin: baseURL, 'content-type': 'application/json' });
