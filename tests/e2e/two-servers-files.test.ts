import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { BrowserContext, Page } from 'playwright-core';
import { ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { knexConfig } from '@/lib/db/config';
import { seedDemo } from '@/db/seeds/demo';
import { startPostgres } from '../support/postgres';
import { startS3Fake, type S3Fake } from '../support/s3';
import { openBrowser, screenshot, signIn, WS } from './support/browser';
import { startServer, type Server } from './support/next-server';

const root = path.resolve(__dirname, '..', '..');

/**
 * Two app servers sharing one PostgreSQL and one S3 bucket (the npm fake s3rver),
 * as the README's "Running on several servers" says: a quote uploaded through
 * one downloads through the other, byte for byte.
 */
describe('quote documents with two app servers, one PostgreSQL and one S3 bucket', () => {
  let pg: { url: string; stop: () => void };
  let s3: S3Fake;
  let k: Knex;
  let shared: Record<string, string>;
  const servers: Server[] = [];
  let A: Server;
  let B: Server;
  let page: Page;
  let context: BrowserContext;
  let close: () => Promise<void>;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-e2e-two-'));

  beforeAll(async () => {
    pg = await startPostgres();
    s3 = await startS3Fake('haulcase-quotes');
    const admin = knex({ client: 'pg', connection: pg.url });
    await admin.raw('create database two_servers');
    await admin.destroy();
    const url = pg.url.replace(/\/[^/]*$/, '/two_servers');
    k = knex(knexConfig({ DATABASE_URL: url }));
    await k.migrate.latest();
    await seedDemo(k);
    shared = { DATABASE_URL: url, NEXTAUTH_SECRET: 'two-servers-shared-secret-for-tests', ...s3.env };
    for (const _ of [0, 1]) {
      const s = await startServer(shared);
      servers.push(s);
      if (s.exited !== null) throw new Error(`server exited:\n${s.output()}`);
    }
    [A, B] = servers;
    ({ page, context, close } = await openBrowser());
  }, 180_000);

  afterAll(async () => {
    await close?.();
    for (const s of servers) s.process.kill('SIGTERM');
    await k?.destroy();
    await s3?.stop();
    pg?.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('refuses to start on PostgreSQL without NEXTAUTH_SECRET, or with a bad setting, naming the variable', async () => {
    const noSecret = await startServer({ ...shared, NEXTAUTH_SECRET: '' });
    servers.push(noSecret);
    expect(noSecret.exited).toBe(1);
    expect(noSecret.output()).toMatch(/Haulcase cannot start: a setting is wrong in the environment:\n\s+NEXTAUTH_SECRET is required with PostgreSQL/);
    const bad = await startServer({ ...shared, HAULCASE_MC_MAX_RUNNING: 'two' });
    servers.push(bad);
    expect(bad.exited).toBe(1);
    expect(bad.output()).toMatch(/HAULCASE_MC_MAX_RUNNING must be a whole number of runs from 1 to 64/);
  }, 120_000);

  it('an analyst uploads a quote through server A and downloads the same bytes through server B', async () => {
    await signIn(page, A.base, 'analyst@aldervane.test');
    await page.goto(`${A.base}/${WS}/offers`);
    await page.getByRole('button', { name: 'Quotes' }).first().click();
    const docs = page.getByTestId('quote-documents');
    const bytes = Buffer.alloc(1_500_007);
    for (let i = 0; i < bytes.length; i++) bytes[i] = (i * 7919) % 251;
    bytes.write('%PDF-1.4\n', 0);
    const file = path.join(dir, 'Shared quote Q-4410.pdf');
    fs.writeFileSync(file, bytes);
    await docs.locator('input[type=file]').setInputFiles(file);
    await docs.getByRole('link', { name: 'Shared quote Q-4410.pdf' }).waitFor();

    // the session cookie is for 127.0.0.1 (any port), signed with the shared secret: server B accepts it
    await page.goto(`${B.base}/${WS}/offers`);
    expect(new URL(page.url()).pathname).toBe(`/${WS}/offers`);
    await page.getByRole('button', { name: 'Quotes' }).first().click();
    const onB = page.getByTestId('quote-documents');
    await onB.getByRole('link', { name: 'Shared quote Q-4410.pdf' }).waitFor();
    await screenshot(page, 'two-servers-quote-on-b');
    const [download] = await Promise.all([page.waitForEvent('download'), onB.getByRole('link', { name: 'Shared quote Q-4410.pdf' }).click()]);
    expect(fs.readFileSync((await download.path())!).equals(bytes)).toBe(true);

    const row = await k('quote_documents').where({ fileName: 'Shared quote Q-4410.pdf' }).first('storageKey', 'size');
    expect(row.size).toBe(bytes.length);
    expect(fs.existsSync(path.join(root, 'data', 'uploads', ...row.storageKey.split('/')))).toBe(false);
    const bucket = new S3Client({ endpoint: s3.endpoint, region: s3.region, forcePathStyle: true, credentials: { accessKeyId: s3.accessKeyId, secretAccessKey: s3.secretAccessKey } });
    const listed = async () => ((await bucket.send(new ListObjectsV2Command({ Bucket: s3.bucket }))).Contents ?? []).map((o) => o.Key);
    expect(await listed()).toEqual([row.storageKey]);

    // removed through B (after its commit), gone from the bucket and from A's list
    page.once('dialog', (d) => void d.accept());
    await onB.getByRole('button', { name: 'Remove' }).click();
    await page.getByText('Removed Shared quote Q-4410.pdf.').waitFor();
    expect(await k('quote_documents').where({ fileName: 'Shared quote Q-4410.pdf' }).first()).toBeUndefined();
    expect(await listed()).toEqual([]);
    await page.goto(`${A.base}/${WS}/offers`);
    await page.getByRole('button', { name: 'Quotes' }).first().click();
    await page.getByText('Upload a quote').waitFor();
    expect(await page.getByTestId('quote-documents').getByRole('link', { name: 'Shared quote Q-4410.pdf' }).count()).toBe(0);
    bucket.destroy();
  }, 120_000);
});
