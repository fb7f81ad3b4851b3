/**
 * The workbook export benchmark itself (bench/workbook.ts bundles it and runs
 * it in a fresh Node process per fleet size, as the server runs: plain node,
 * no tsx loader, no heap left by the other benchmarks), so the process's
 * peak resident memory (`maxRSS`, the worker thread's included) is the
 * export's own.
 *
 * Each run is what the route does after reading the case: the workbook
 * worker thread (the bundle .haulcase/workbook-worker.cjs, kept between
 * exports as the server keeps it: the first run starts it) evaluates the
 * case and streams the workbook into a temporary file. Arguments: project folder, fleet size,
 * runs, worker bundle. Prints one JSON line: the wall and CPU times of the
 * runs (ms; CPU of every thread of the process), the file size (bytes) and
 * the peak RSS (bytes).
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import type { WorkbookJob } from '@/lib/export/workbook-job';
import { runWorkbookJob } from '@/lib/export/workbook-pool';
import { validateCase, type CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './synthetic-fleet';

async function exportInWorker(bundle: string, job: Omit<WorkbookJob, 'id'>): Promise<number> {
  const reply = await runWorkbookJob({ bundle, timeLimitMs: 600_000, idleMs: 60_000 }, job);
  if (!reply.ok) throw new Error(reply.message);
  return reply.bytes;
}

async function main(root: string, size: number, runs: number, bundle: string): Promise<void> {
  const base = JSON.parse(readFileSync(path.join(root, 'scenarios', 'aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
  const v = validateCase(syntheticFleet(base, size));
  if (!v.ok) throw new Error('synthetic case does not validate');
  const dir = mkdtempSync(path.join(os.tmpdir(), 'haulcase-bench-wb-'));
  const times: number[] = [];
  const cpu: number[] = [];
  let bytes = 0;
  try {
    for (let i = 0; i < runs; i++) {
      const t0 = performance.now();
      const c0 = process.cpuUsage();
      bytes = await exportInWorker(bundle, { caseFile: v.value, meta: {}, file: path.join(dir, `run-${i}.xlsx`) });
      times.push(performance.now() - t0);
      const c = process.cpuUsage(c0);
      cpu.push((c.user + c.system) / 1000);
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  console.log(JSON.stringify({ times, cpu, bytes, maxRss: process.resourceUsage().maxRSS * 1024 }));
}

const [root, size, runs, bundle] = process.argv.slice(2);
main(root, Number(size), Number(runs), bundle).catch((err) => {
  console.error(err);
  process.exit(1);
});
