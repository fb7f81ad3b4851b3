/**
 * Fleet import of a 5,000-row CSV into a fresh SQLite demo database: reading
 * the file, validating every row, and committing in one transaction, each
 * timed (median of a few runs; the commit is rolled back between runs).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex from 'knex';
import Papa from 'papaparse';
import { seedDemo } from '@/db/seeds/demo';
import type { Access } from '@/lib/auth/access';
import { knexConfig } from '@/lib/db/config';
import { FLEET_COLUMNS } from '@/lib/import/columns';
import { commitFleetImport, loadImportLookups } from '@/lib/import/fleet-import';
import { readTable } from '@/lib/import/read-table';
import { planFleetImport } from '@/lib/import/validate-fleet';

const ROWS = 5000;

function fleetCsv(n: number): Uint8Array {
  const rows = Array.from({ length: n }, (_, i) => [
    `B${String(i).padStart(5, '0')}`, i % 3 ? '300 t' : '230 t', i % 3 ? 'ac-2600-legacy' : 'ac-1900-legacy', i % 3 ? 'kestrel-km2700' : 'brannock-bd2000',
    (i * 37) % 21000, 40000 + (i % 30000), 5400 + (i % 1200), (0.4 + (i % 15) / 100).toFixed(2), 600 + (i % 300), i % 4 ? '' : (220 + (i % 150)).toFixed(1), 'bench row',
  ]);
  return new TextEncoder().encode(Papa.unparse([FLEET_COLUMNS.map((c) => c.name), ...rows]));
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
    const access = { userId: analyst.id, role: 'analyst', workspace: { id: ws.id, slug: ws.slug, name: ws.name, currency: ws.currency, settings: { units: 'metric', negativeStyle: 'parentheses', approvalsRequired: 1 } } } as Access;
    const bytes = fleetCsv(ROWS);
    const t = { read: [] as number[], validate: [] as number[], commit: [] as number[], total: [] as number[] };
    for (let run = 0; run < 5; run++) {
      const t0 = performance.now();
      const table = await readTable('bench.csv', bytes);
      const t1 = performance.now();
      const trx = await k.transaction();
      const plan = planFleetImport(table, await loadImportLookups(trx, ws.id));
      const t2 = performance.now();
      if (plan.problems.length) throw new Error(`bench file has problems: ${JSON.stringify(plan.problems.slice(0, 3))}`);
      await commitFleetImport(trx, access, plan, 'bench.csv');
      const t3 = performance.now();
      await trx.rollback();
      t.read.push(t1 - t0);
      t.validate.push(t2 - t1);
      t.commit.push(t3 - t2);
      t.total.push(t3 - t0);
    }
    console.log(`fleet import, ${ROWS.toLocaleString('en-US')} rows (${(bytes.length / 1024).toFixed(0)} KB CSV), SQLite, median of 5:`);
    console.log(`  read CSV          ${median(t.read).toFixed(1).padStart(8)} ms`);
    console.log(`  validate rows     ${median(t.validate).toFixed(1).padStart(8)} ms`);
    console.log(`  commit (1 trx)    ${median(t.commit).toFixed(1).padStart(8)} ms`);
    console.log(`  total             ${median(t.total).toFixed(1).padStart(8)} ms`);
  } finally {
    await k.destroy();
    fs.rmSync(dir, { recursive: true, force: true });
  }
}
