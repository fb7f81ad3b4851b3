/**
 * Readings import of 100 trucks × 60 months (6,000 rows) in one CSV into a
 * fresh SQLite demo database (issue 20, target under 2 s): reading the file,
 * validating every row (meter order per truck included), and committing in
 * one transaction, each timed (median of 5 runs; the commit is rolled back
 * between runs). Printed with the load average, since the machine is shared.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex from 'knex';
import Papa from 'papaparse';
import { seedDemo } from '@/db/seeds/demo';
import type { Access } from '@/lib/auth/access';
import { knexConfig } from '@/lib/db/config';
import { readTable } from '@/lib/import/read-table';
import { monthMinus } from '@/lib/readings/derive';
import { commitReadingsImport, loadReadingLookups } from '@/lib/readings/import-commit';
import { planReadingsImport, READING_COLUMNS } from '@/lib/readings/import-plan';

const TRUCKS = 100;
const MONTHS = 60;

function readingsCsv(): Uint8Array {
  const rows: Array<Array<string | number>> = [];
  for (let t = 0; t < TRUCKS; t++) {
    let meter = 10_000 + t * 37;
    for (let m = 0; m < MONTHS; m++) {
      const hours = 450 + ((t * 7 + m * 13) % 90);
      meter += hours;
      rows.push([`BR${String(t).padStart(3, '0')}`, monthMinus('2021-01', -m), meter, hours * 340, m % 3 ? '' : hours * 800, m % 24 === 23 ? 1 : '', '', m % 24 === 23 ? 9 : '', '', '', '', '']);
    }
  }
  return new TextEncoder().encode(Papa.unparse([READING_COLUMNS.map((c) => c.name), ...rows]));
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[xs.length >> 1];

export async function run(): Promise<void> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-bench-'));
  const k = knex(knexConfig({ HAULCASE_DATA_DIR: dir }));
  try {
    await k.migrate.latest();
    await seedDemo(k);
    const ws = await k('workspaces').where({ slug: 'aldervane-north-pit' }).first();
    const analyst = await k('users').where({ email: 'analyst@aldervane.test' }).first('id');
    const engine = await k('engine_types').where({ workspaceId: ws.id }).first('id');
    const now = new Date().toISOString();
    await k.batchInsert('trucks', Array.from({ length: TRUCKS }, (_, t) => ({
      workspaceId: ws.id, unitNumber: `BR${String(t).padStart(3, '0')}`, engineTypeId: engine.id, engineHours: 5000, remainingLifeHours: 40000, annualHours: 6000,
      loadFactor: 0.5, tonnesPerHour: 800, version: 1, createdAt: now, updatedAt: now,
    })), 100);
    const access = { userId: analyst.id, role: 'analyst', workspace: { id: ws.id, slug: ws.slug, name: ws.name, currency: ws.currency, settings: { units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 1 } } } as Access;
    const bytes = readingsCsv();
    const t = { read: [] as number[], validate: [] as number[], commit: [] as number[], total: [] as number[] };
    for (let r = 0; r < 5; r++) {
      const t0 = performance.now();
      const table = await readTable('readings.csv', bytes);
      const t1 = performance.now();
      const trx = await k.transaction();
      const plan = planReadingsImport(table, await loadReadingLookups(trx, ws.id), 'refuse', new Date());
      const t2 = performance.now();
      if (plan.problems.length) throw new Error(`bench file has problems: ${JSON.stringify(plan.problems.slice(0, 3))}`);
      await commitReadingsImport(trx, access, plan, 'readings.csv');
      const t3 = performance.now();
      await trx.rollback();
      t.read.push(t1 - t0);
      t.validate.push(t2 - t1);
      t.commit.push(t3 - t2);
      t.total.push(t3 - t0);
    }
    const load = os.loadavg().map((l) => l.toFixed(2)).join(' ');
    console.log(`readings import, ${TRUCKS} trucks × ${MONTHS} months = ${(TRUCKS * MONTHS).toLocaleString('en-US')} rows (${(bytes.length / 1024).toFixed(0)} KB CSV), SQLite, median of 5 (target < 2 s; load average ${load}):`);
    console.log(`  read CSV          ${median(t.read).toFixed(1).padStart(8)} ms`);
    console.log(`  validate rows     ${median(t.validate).toFixed(1).padStart(8)} ms`);
    console.log(`  commit (1 trx)    ${median(t.commit).toFixed(1).padStart(8)} ms`);
    console.log(`  total             ${median(t.total).toFixed(1).padStart(8)} ms`);
  } finally {
    await k.destroy();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
