/**
 * Monte Carlo runs with two app servers on one PostgreSQL (the job queue,
 * lib/risk/backends/queue.ts), as the README's "Running on several servers"
 * says: an analyst starts a run on server A's risk page and reads its result on
 * server B's; a long run started on A is followed and cancelled on B; and the
 * server holding a run killed with SIGKILL mid-run has the run taken over by
 * the other after the queue's expiry, never left running.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex, { type Knex } from 'knex';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Page } from 'playwright-core';
import { knexConfig } from '@/lib/db/config';
import { seedDemo } from '@/db/seeds/demo';
import { startPostgres } from '../support/postgres';
import { insertDemoCase } from '../support/demo-case';
import { apiHeaders, openBrowser, screenshot, signIn, WS } from './support/browser';
import { startServer, type Server } from './support/next-server';

/** the queue's expiry on these servers (s); a run's time limit is below it */
const EXPIRE_S = 70;

describe('Monte Carlo runs with two app servers and one PostgreSQL', () => {
  let pg: { url: string; stop: () => void };
  let k: Knex;
  const servers: Server[] = [];
  let A: Server;
  let B: Server;
  let page: Page;
  let close: () => Promise<void>;
  let caseId: number;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-e2e-mc-'));

  beforeAll(async () => {
    pg = await startPostgres();
    const admin = knex({ client: 'pg', connection: pg.url });
    await admin.raw('create database two_servers_mc');
    await admin.destroy();
    const url = pg.url.replace(/\/[^/]*$/, '/two_servers_mc');
    k = knex(knexConfig({ DATABASE_URL: url }));
    await k.migrate.latest();
    await seedDemo(k);
    caseId = await insertDemoCase(k, WS);
    const shared = {
      DATABASE_URL: url, NEXTAUTH_SECRET: 'two-servers-shared-secret-for-tests', HAULCASE_UPLOAD_DIR: dir,
      HAULCASE_MC_QUEUE_EXPIRE_S: String(EXPIRE_S), HAULCASE_MC_TIME_LIMIT_MS: '60000',
    };
    for (const _ of [0, 1]) {
      const s = await startServer(shared);
      servers.push(s);
      if (s.exited !== null) throw new Error(`server exited:\n${s.output()}`);
    }
    [A, B] = servers;
    ({ page, close } = await openBrowser());
  }, 180_000);

  afterAll(async () => {
    await close?.();
    for (const s of servers) if (s.process.exitCode === null) s.process.kill('SIGTERM');
    await k?.destroy();
    pg?.stop();
    fs.rmSync(dir, { recursive: true, force: true });
  });

  const status = () => page.getByTestId('mc-status');
  /** Waits for the run's status line to match; on a timeout, says what it read instead. */
  const statusIs = async (re: RegExp, timeout = 120_000) => {
    try {
      await page.waitForFunction((src) => new RegExp(src).test(document.querySelector('[data-testid="mc-status"]')?.textContent ?? ''), re.source, { timeout });
    } catch (e) {
      throw new Error(`status never matched ${re}; it reads: ${await status().textContent().catch(() => '(none)')}`, { cause: e });
    }
  };

  it('an analyst runs a Monte Carlo on server A and reads the same result on server B', async () => {
    await signIn(page, A.base, 'analyst@aldervane.test');
    await page.goto(`${A.base}/${WS}/cases/${caseId}/risk`);
    await page.getByLabel('Iterations', { exact: true }).fill('2000');
    await page.getByLabel('Seed', { exact: true }).fill('7');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await statusIs(/of 2,000 iterations · finished/);
    await page.getByTestId('mc-histogram').waitFor();
    const lossOnA = await page.getByTestId('mc-loss').textContent();
    expect(lossOnA).toMatch(/Chance the proposal loses money against rebuilding every engine: \d+(\.\d)? %/);

    await page.goto(`${B.base}/${WS}/cases/${caseId}/risk`);
    expect(new URL(page.url()).pathname).toBe(`/${WS}/cases/${caseId}/risk`);
    await statusIs(/of 2,000 iterations · finished/);
    await page.getByTestId('mc-histogram').waitFor();
    expect(await page.getByTestId('mc-loss').textContent()).toBe(lossOnA);
    expect(await page.getByTestId('mc-trucks').locator('tbody tr').count()).toBe(24);
    await screenshot(page, 'two-servers-monte-carlo-on-b');
    const run = await k('monte_carlo_runs').orderBy('createdAt', 'desc').first();
    expect(run).toMatchObject({ status: 'done', done: 2000 });
    expect((await k('monte_carlo_run_claims').where({ runId: run.id }).first()).attempt).toBe(1);
  }, 300_000);

  it('a long run started on A is followed and cancelled on B', async () => {
    await page.goto(`${A.base}/${WS}/cases/${caseId}/risk`);
    await page.getByLabel('Iterations', { exact: true }).fill('100000');
    await page.getByRole('button', { name: 'Run Monte Carlo' }).click();
    await statusIs(/of 100,000 iterations · running/, 30_000);

    await page.goto(`${B.base}/${WS}/cases/${caseId}/risk`);
    await statusIs(/of 100,000 iterations · running/, 30_000);
    await page.waitForFunction(() => Number(document.querySelector('[role="progressbar"]')?.getAttribute('aria-valuenow')) > 0, null, { timeout: 60_000 });
    await page.getByRole('button', { name: 'Cancel run' }).click();
    await statusIs(/cancelled/, 30_000);
    const done = Number(await page.getByRole('progressbar', { name: 'Monte Carlo progress' }).getAttribute('aria-valuenow'));
    expect(done).toBeGreaterThan(0);
    expect(done).toBeLessThan(100000);
    expect(await page.getByRole('button', { name: 'Cancel run' }).count()).toBe(0);
    const run = await k('monte_carlo_runs').orderBy('createdAt', 'desc').first();
    expect(run).toMatchObject({ status: 'cancelled', done });
    expect(JSON.parse(run.result).iterations).toBe(done);
  }, 180_000);

  it('a server killed mid-run (SIGKILL): the other takes the run over after the expiry and finishes it', async () => {
    const started = await page.request.post(`${A.base}/api/workspaces/${WS}/cases/${caseId}/monte-carlo`, {
      headers: apiHeaders(A.base),
      data: { iterations: 100000, seed: 5, sampleFailures: true },
    });
    expect(started.status()).toBe(202);
    const runId = (await started.json()).run.id as string;
    // whichever server took it: its process id is in the claim ("host:pid")
    let holder = '';
    for (let i = 0; i < 200 && !holder; i++) {
      const c = await k('monte_carlo_run_claims').where({ runId }).first();
      const r = await k('monte_carlo_runs').where({ id: runId }).first('done');
      if (c.attempt === 1 && r.done > 0) holder = c.server;
      else await new Promise((res) => setTimeout(res, 100));
    }
    expect(holder).toMatch(/:\d+$/);
    const pid = Number(holder.split(':').pop());
    const victim = servers.find((s) => s.process.pid === pid) ?? null;
    const survivor = victim === A ? B : A;
    // `next start` serves in its own process: the one we started
    expect(victim).not.toBeNull();
    victim!.process.kill('SIGKILL');
    const killedAt = Date.now();

    let ended: Record<string, unknown> | null = null;
    while (!ended && Date.now() - killedAt < (EXPIRE_S + 60) * 1000) {
      const r = await (await page.request.get(`${survivor.base}/api/workspaces/${WS}/cases/${caseId}/monte-carlo/${runId}`)).json();
      if (r.run.finishedAt) ended = r.run;
      else await new Promise((res) => setTimeout(res, 500));
    }
    expect(ended).toMatchObject({ status: 'done', done: 100000, error: null });
    expect(Date.now() - killedAt).toBeGreaterThanOrEqual((EXPIRE_S - 2) * 1000);
    const claim = await k('monte_carlo_run_claims').where({ runId }).first();
    expect(claim.attempt).toBe(2);
    expect(claim.server).not.toBe(holder);
    // nothing half-written: every run has ended with its figures, none is left running
    expect(await k('monte_carlo_runs').where({ status: 'running' })).toEqual([]);
    for (const r of await k('monte_carlo_runs').select('status', 'done', 'result')) expect(JSON.parse(r.result).iterations).toBe(r.done);

    // the page on the surviving server shows it finished
    await page.goto(`${survivor.base}/${WS}/cases/${caseId}/risk`);
    await statusIs(/of 100,000 iterations · finished/);
    await screenshot(page, 'two-servers-monte-carlo-taken-over');
  }, 300_000);
});
