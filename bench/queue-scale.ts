/**
 * Monte Carlo runs on the PostgreSQL job queue (lib/risk/backends/queue.ts):
 * 20 runs of 2,000 iterations × 28 trucks submitted at once, taken by one
 * "server" and then by two, each a queue backend with HAULCASE_MC_MAX_RUNNING=2
 * runs at once of one worker thread each, on a throw-away PostgreSQL.
 * Prints the batch's total time and the share of runs each server ran.
 *
 * The two servers here are two backends in this one process, so they share
 * this machine's cores: on a 2-core machine the second server adds slots, not
 * cores, and the figure shows the queue spreading the batch, not a speed-up.
 * With a machine (or the cores for two runs) per server the batch should take
 * about half the one-server time.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import knex from 'knex';
import { knexConfig } from '@/lib/db/config';
import { seedDemo } from '@/db/seeds/demo';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { createQueueBackend } from '@/lib/risk/backends/queue';
import { validateCase, type CaseFile } from '@/lib/validation/case';
import { startPostgres } from '../tests/support/postgres';
import { insertDemoCase } from '../tests/support/demo-case';

const RUNS = 20;
const ITERATIONS = 2000;
const TRUCKS = 28;

/** The demo scenario with four more trucks (copies of the first four under new ids): 28 trucks. */
function caseOf28(root: string): CaseFile {
  const raw = JSON.parse(readFileSync(path.join(root, 'scenarios', 'aldervane-north-pit.json'), 'utf8'));
  const extra = raw.trucks.slice(0, TRUCKS - raw.trucks.length).map((t: { id: string }, i: number) => ({ ...t, id: `${t.id}-B${i + 1}` }));
  raw.trucks = [...raw.trucks, ...extra];
  const v = validateCase(raw);
  if (!v.ok) throw new Error('the 28-truck scenario is not a valid case');
  return v.value as CaseFile;
}

export async function run(): Promise<void> {
  const root = path.resolve(__dirname, '..');
  process.env.HAULCASE_MC_WORKER = await buildMonteCarloWorker(root);
  const caseFile = caseOf28(root);
  const pg = await startPostgres();
  const rows: string[] = [];
  try {
    for (const count of [1, 2]) {
      const admin = knex({ client: 'pg', connection: pg.url });
      await admin.raw(`create database scale_${count}`);
      await admin.destroy();
      const url = pg.url.replace(/\/[^/]*$/, `/scale_${count}`);
      const k = knex(knexConfig({ DATABASE_URL: url }));
      await k.migrate.latest();
      await seedDemo(k);
      const caseId = await insertDemoCase(k, 'aldervane-north-pit');
      const c = await k('business_cases').where({ id: caseId }).first('workspaceId', 'createdBy');
      const servers = Array.from({ length: count }, (_, i) =>
        createQueueBackend({ connectionString: url, db: () => k, server: `server ${String.fromCharCode(65 + i)}`, maxRunning: 2, workers: 1, expireSeconds: 600, pollSeconds: 0.5, progressMs: 250 }),
      );
      await Promise.all(servers.map((s) => s.startWorkers()));
      const spec = {
        iterations: ITERATIONS, seed: 1, sampleFailures: true, measure: 'proposal' as const,
        distributions: [{ driver: 'fuelPrice', distribution: { kind: 'triangular' as const, min: 0.85, mode: 1.05, max: 1.4 } }],
      };
      const start = (i: number) => servers[i % count].start({ workspaceId: c.workspaceId, caseId, userId: c.createdBy, caseFile, spec: { ...spec, seed: i + 1 } });
      // one run first, so both batches find warm worker threads
      const warm = await start(0);
      while (!(await k('monte_carlo_runs').where({ id: warm.id }).first('finishedAt')).finishedAt) await new Promise((r) => setTimeout(r, 50));
      await k('monte_carlo_run_claims').where({ runId: warm.id }).delete();

      const t0 = performance.now();
      const ids = (await Promise.all(Array.from({ length: RUNS }, (_, i) => start(i)))).map((r) => r.id);
      for (;;) {
        const open = await k('monte_carlo_runs').whereIn('id', ids).whereNull('finishedAt').count({ n: '*' }).first();
        if (Number(open?.n) === 0) break;
        await new Promise((r) => setTimeout(r, 50));
      }
      const ms = performance.now() - t0;
      const done = await k('monte_carlo_runs').whereIn('id', ids).where({ status: 'done' }).count({ n: '*' }).first();
      const share = (await k('monte_carlo_run_claims').whereIn('runId', ids).select('server').count({ n: '*' }).groupBy('server').orderBy('server')) as unknown as Array<{ server: string; n: string }>;
      rows.push(
        `${count} server${count === 1 ? ' ' : 's'}: ${RUNS} runs (${Number(done?.n)} done) in ${(ms / 1000).toFixed(2)} s; ` +
          share.map((s) => `${s.server} ran ${s.n}`).join(', '),
      );
      await Promise.all(servers.map((s) => s.stop()));
      await k.destroy();
    }
  } finally {
    pg.stop();
  }
  console.log(`Monte Carlo on the job queue: ${RUNS} runs of ${ITERATIONS.toLocaleString('en')} iterations × ${TRUCKS} trucks submitted at once (2 runs at once per server, 1 worker thread each)`);
  for (const r of rows) console.log(`  ${r}`);
  console.log('  (the servers are two queue backends in one process on the same cores: on this 2-core machine the second adds slots, not cores)');
}

// `tsx bench/queue-scale.ts` runs it alone
if (require.main === module) {
  run().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}
