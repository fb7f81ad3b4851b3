/**
 * The case result route's work (issue 18), in process on a fresh SQLite demo
 * database: for the demo's 24 trucks and a synthetic 200-truck workspace, the
 * first answer (load, validate, evaluate, solve the programme, serialise: a
 * cache miss), a repeated answer (load and hash only: a hit), a revalidation
 * that the client already holds (304, no body), and the size of the answer
 * against the full evaluation it leaves the by-year breakdowns out of.
 * Medians with the load average, since the machine is shared; the figures
 * to compare are the ratios within one run. HTTP (Next's own compression and
 * routing) is not in these figures.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex from 'knex';
import { seedDemo } from '@/db/seeds/demo';
import { findMembership } from '@/lib/auth/access';
import { useDbForTests } from '@/lib/db';
import { knexConfig } from '@/lib/db/config';
import { evaluateStoredCase } from '@/lib/cases/evaluate';
import { cachedResultBody, clearResultCache } from '@/lib/cases/result-cache';
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

export async function run(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-bench-'));
  const k = knex(knexConfig({ HAULCASE_DATA_DIR: dir }));
  useDbForTests(k);
  try {
    await k.migrate.latest();
    await seedDemo(k);
    await createSyntheticWorkspace(k, 'synthetic-200', 200, 'analyst@aldervane.test');
    const analyst = await k('users').where({ email: 'analyst@aldervane.test' }).first('id');
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
  } finally {
    clearResultCache();
    await k.destroy();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
