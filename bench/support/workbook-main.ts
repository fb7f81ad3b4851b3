/**
 * The workbook export benchmark itself (bench/workbook.ts bundles it and runs
 * it in a fresh Node process per fleet size, as the server runs: plain node,
 * no tsx loader, no heap left by the other benchmarks), so the process's
 * peak resident memory (`maxRSS`) is the export's own.
 *
 * Arguments: project folder, fleet size, runs. Prints one JSON line:
 * the wall and CPU times of the runs (ms; CPU of every thread of the process), the file size (bytes) and the peak RSS (bytes).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { writeCaseWorkbook } from '@/lib/export/workbook';
import { validateCase, type CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './synthetic-fleet';

async function main(root: string, size: number, runs: number): Promise<void> {
  const base = JSON.parse(readFileSync(path.join(root, 'scenarios', 'aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
  const v = validateCase(syntheticFleet(base, size));
  if (!v.ok) throw new Error('synthetic case does not validate');
  const times: number[] = [];
  const cpu: number[] = [];
  let bytes = 0;
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    const c0 = process.cpuUsage();
    bytes = (await writeCaseWorkbook(v.value)).length;
    times.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  console.log(JSON.stringify({ times, cpu, bytes, maxRss: process.resourceUsage().maxRSS * 1024 }));
}

const [root, size, runs] = process.argv.slice(2);
main(root, Number(size), Number(runs)).catch((err) => {
  console.error(err);
  process.exit(1);
});
