/**
 * Workbook export of synthetic 100- and 500-truck cases: time to evaluate and
 * write the XLSX (median of a few runs) and the file size.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { writeCaseWorkbook } from '@/lib/export/workbook';
import { validateCase, type CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './support/synthetic-fleet';

export async function run(): Promise<void> {
  const file = path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json');
  const base = JSON.parse(readFileSync(file, 'utf8')) as CaseFileInput;
  for (const [size, runs] of [[100, 3], [500, 2]] as const) {
    const v = validateCase(syntheticFleet(base, size));
    if (!v.ok) throw new Error('synthetic case does not validate');
    const times: number[] = [];
    let bytes = 0;
    for (let i = 0; i < runs; i++) {
      const t0 = performance.now();
      bytes = (await writeCaseWorkbook(v.value)).length;
      times.push(performance.now() - t0);
    }
    times.sort((a, b) => a - b);
    const median = times[Math.floor(times.length / 2)];
    console.log(
      `workbook, ${String(size).padStart(3)} trucks   median ${(median / 1000).toFixed(2).padStart(6)} s   ${(bytes / 1024 / 1024).toFixed(2).padStart(6)} MiB   (${runs} runs)`,
    );
  }
}
