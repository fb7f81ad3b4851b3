/**
 * Workbook export of synthetic 100-, 500- and 2,000-truck cases, the way the
 * route runs it (the workbook worker thread, kept between exports, evaluates
 * the case and streams the XLSX into a file): time (median of a few runs;
 * the first starts the worker), the file size and the peak resident memory
 * of the process, with the CPU time beside the wall time (the machine is
 * shared) and the load average before → after. Each size runs in a fresh
 * Node process (support/workbook-main.ts, bundled with esbuild, plain
 * node), so the peak is that export's alone. Targets (issue 18): 100 trucks
 * ≤ 1 s, 2,000 trucks ≤ 20 s and ≤ 500 MB peak.
 *
 * Alone: `npx tsx --conditions=react-server bench/workbook.ts`.
 */
import { spawnSync } from 'node:child_process';
import { loadavg } from 'node:os';
import path from 'node:path';
import { buildWorkbookWorker } from '@/lib/export/build-workbook-worker';
import { bundleForNode } from '@/lib/risk/build-worker';

const SIZES = [
  [100, 5],
  [500, 2],
  [2000, 1],
] as const;

const TARGETS: Record<number, { seconds: number; mb?: number }> = { 100: { seconds: 1 }, 2000: { seconds: 20, mb: 500 } };

export async function run(): Promise<void> {
  const root = path.resolve(__dirname, '..');
  const worker = await buildWorkbookWorker(root);
  const outfile = await bundleForNode(path.join(__dirname, 'support', 'workbook-main.ts'), path.join(root, '.haulcase', 'bench-workbook.cjs'), root);
  for (const [size, runs] of SIZES) {
    const load = loadavg()[0];
    const r = spawnSync(process.execPath, [outfile, root, String(size), String(runs), worker], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'] });
    if (r.status !== 0) throw new Error(`the workbook benchmark (${size} trucks) exited with ${r.status ?? r.signal}`);
    const out = JSON.parse(r.stdout.trim().split('\n').pop() as string) as { times: number[]; cpu: number[]; bytes: number; maxRss: number };
    const times = [...out.times].sort((a, b) => a - b);
    const median = times[Math.floor(times.length / 2)] / 1000;
    const cpu = [...out.cpu].sort((a, b) => a - b)[Math.floor(out.cpu.length / 2)] / 1000;
    const cold = runs > 1 ? `, first run (worker started) ${(out.times[0] / 1000).toFixed(2)} s` : '';
    const mb = out.maxRss / 1e6;
    const target = TARGETS[size];
    const verdict = target
      ? `   target ≤ ${target.seconds} s${target.mb ? ` and ≤ ${target.mb} MB` : ''} → ${median <= target.seconds && (!target.mb || mb <= target.mb) ? 'met' : 'NOT met'}`
      : '';
    console.log(
      `workbook, ${String(size).padStart(4)} trucks   median ${median.toFixed(2).padStart(6)} s (cpu ${cpu.toFixed(2).padStart(6)} s)   ${(out.bytes / 1024 / 1024).toFixed(2).padStart(6)} MiB   peak RSS ${mb.toFixed(0).padStart(5)} MB   (${runs} run${runs > 1 ? 's' : ''}${cold}, load ${load.toFixed(2)} → ${loadavg()[0].toFixed(2)})${verdict}`,
    );
  }
}

if (require.main === module) {
  run().catch((err) => {
    console.error(err);
    process.exit(1);
  });
}
