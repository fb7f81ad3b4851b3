/**
 * The case result route's work (issue 18), in process on a fresh SQLite demo
 * database: for the demo's 24 trucks and a synthetic 200-truck workspace, the
 * first answer (load, validate, evaluate, solve the programme, serialise: a
 * cache miss), a repeated answer (load and hash only: a hit), a revalidation
 * that the client already holds (304, no body), and the size of the answer
 * against the full evaluation it leaves the by-year breakdowns out of.
 * Medians with the load average, since the machine is shared; the figures
 * to compare are the ratios within one run.
 *
 * Then over HTTP, when a production build is there (`npm run build`, or the
 * browser tests' .next-e2e): `next start` on the same database, signed in as
 * the demo analyst, autocannon at 20 connections (10 s each, 20 s with
 * BENCH_FULL=1) on the route with gzip, and on the 304 revalidation.
 * Targets (issue 18): p95 ≤ 50 ms at 24 trucks, ≤ 150 ms at 200; autocannon
 * reports p97.5, printed as the stricter stand-in for p95.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import autocannon from 'autocannon';
import knex from 'knex';
import { seedDemo } from '@/db/seeds/demo';
import { findMembership } from '@/lib/auth/access';
import { useDbForTests } from '@/lib/db';
import { knexConfig } from '@/lib/db/config';
import { evaluateStoredCase } from '@/lib/cases/evaluate';
import { cachedResultBody, clearResultCache } from '@/lib/cases/result-cache';
import { startServer } from '../tests/e2e/support/next-server';
import { createSyntheticWorkspace } from '../tests/e2e/support/synthetic-fleet';

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1];
const load = () => os.loadavg()[0].toFixed(2);

async function timed(runs: number, fn: () => Promise<unknown>): Promise<number> {
  await fn();
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    await fn();
    samples.push(performance.now() - t0);
  }
  return median(samples);
}

const root = path.resolve(__dirname, '..');

/** Signs in through next-auth's credentials callback; the session cookie. */
async function signInCookie(base: string, email: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`);
  const jar = csrf.headers.getSetCookie().map((c) => c.split(';')[0]);
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const r = await fetch(`${base}/api/auth/callback/credentials`, {
    method: 'POST',
    redirect: 'manual',
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie: jar.join('; '), origin: base },
    body: new URLSearchParams({ email, password: 'haulcase-demo', csrfToken, json: 'true' }),
  });
  const session = r.headers.getSetCookie().map((c) => c.split(';')[0]).filter((c) => c.includes('session-token'));
  if (!session.length) throw new Error(`sign-in failed (${r.status})`);
  return [...jar, ...session].join('; ');
}

async function overHttp(dir: string, cases: Array<{ slug: string; id: number; label: string }>): Promise<void> {
  const distDir = ['.next', '.next-e2e'].find((d) => fs.existsSync(path.join(root, d, 'BUILD_ID')));
  if (!distDir) {
    console.log('case result over HTTP: no production build here (run `npm run build` first); not measured');
    return;
  }
  const server = await startServer({ NEXT_DIST_DIR: distDir, HAULCASE_DATA_DIR: dir, NEXTAUTH_SECRET: 'bench-secret-not-for-production' });
  const base = server.base;
  try {
    if (server.exited !== null) throw new Error(`next start exited with ${server.exited}: ${server.output()}`);
    const cookie = await signInCookie(base, 'analyst@aldervane.test');
    const duration = process.env.BENCH_FULL === '1' ? 20 : 10;
    for (const c of cases) {
      const url = `${base}/api/workspaces/${c.slug}/cases/${c.id}/result`;
      const first = await fetch(url, { headers: { cookie } });
      if (first.status !== 200) throw new Error(`result route answered ${first.status}`);
      const etag = first.headers.get('etag')!;
      for (const [what, headers] of [
        ['gzip', { cookie, 'accept-encoding': 'gzip' }],
        ['304', { cookie, 'accept-encoding': 'gzip', 'if-none-match': etag }],
      ] as const) {
        const r = await autocannon({ url, connections: 20, duration, headers: { ...headers } });
        const target = c.label.startsWith('24') ? 50 : 150;
        console.log(
          `case result HTTP, ${c.label.padEnd(10)} ${what.padEnd(4)} ${r.requests.average.toFixed(0).padStart(6)} req/s   p50 ${String(r.latency.p50).padStart(5)} ms   p97.5 ${String(r.latency.p97_5).padStart(5)} ms   p99 ${String(r.latency.p99).padStart(5)} ms   ${what === '304' ? '304 answers' : 'non-2xx'} ${r.non2xx}   (20 connections, ${duration} s, load ${load()}; target p95 ≤ ${target} ms → ${r.latency.p97_5 <= target ? 'met' : 'NOT met'})`,
        );
      }
    }
  } finally {
    server.process.kill('SIGTERM');
  }
}

export async function run(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-bench-'));
  const k = knex(knexConfig({ HAULCASE_DATA_DIR: dir }));
  useDbForTests(k);
  try {
    await k.migrate.latest();
    await seedDemo(k);
    await createSyntheticWorkspace(k, 'synthetic-200', 200, 'analyst@aldervane.test');
    const analyst = await k('users').where({ email: 'analyst@aldervane.test' }).first('id');
    const cases: Array<{ slug: string; id: number; label: string }> = [];
    for (const slug of ['aldervane-north-pit', 'synthetic-200']) {
      const access = (await findMembership(analyst.id, slug))!;
      const ws = access.workspace.id;
      const set = await k('assumption_sets').where({ workspaceId: ws, name: 'Base' }).first('id');
      const trucks = await k('trucks').where({ workspaceId: ws }).orderBy('unitNumber').select('id');
      const now = new Date().toISOString();
      const selection = JSON.stringify(trucks.map((t) => ({ truckId: t.id, repowerOfferId: null })));
      const [row] = await k('business_cases')
        .insert({ workspaceId: ws, name: 'Bench', assumptionSetId: set.id, selection, plan: '{}', status: 'draft', createdAt: now, updatedAt: now })
        .returning('id');
      const id = typeof row === 'object' ? row.id : row;
      const label = `${trucks.length} trucks`;
      cases.push({ slug, id, label });
      const cold = await timed(5, async () => {
        clearResultCache();
        await cachedResultBody(access, id, null);
      });
      const { etag, body } = await cachedResultBody(access, id, null);
      const hit = await timed(20, () => cachedResultBody(access, id, null));
      const notModified = await timed(20, () => cachedResultBody(access, id, etag));
      const full = JSON.stringify(await evaluateStoredCase(access, id)).length;
      const bytes = body!.length;
      console.log(`case result, ${label.padEnd(10)} first answer ${cold.toFixed(1).padStart(7)} ms   cached ${hit.toFixed(1).padStart(6)} ms (${(cold / hit).toFixed(0)}× faster)   304 ${notModified.toFixed(1).padStart(6)} ms   (load ${load()})`);
      console.log(`case result, ${label.padEnd(10)} body ${(bytes / 1024).toFixed(0)} KB = ${((100 * bytes) / full).toFixed(0)} % of the full evaluation's ${(full / 1024).toFixed(0)} KB`);
    }
    await overHttp(dir, cases);
  } finally {
    clearResultCache();
    await k.destroy();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
