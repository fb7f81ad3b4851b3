/**
 * Monte Carlo benchmark (target: 10,000 iterations × 100 trucks in 1.5 s or
 * less, 2 worker threads on this 2-core machine). The measurement is in
 * support/monte-carlo-main.ts; it is bundled with esbuild and run in a fresh
 * Node process, the way the server runs (plain node), so neither tsx's loader
 * nor the heap of the benchmarks before it weighs on the main thread.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { buildMonteCarloWorker, bundleForNode } from '@/lib/risk/build-worker';

export async function run(): Promise<void> {
  const root = path.resolve(__dirname, '..');
  const worker = await buildMonteCarloWorker(root);
  const outfile = await bundleForNode(path.join(__dirname, 'support', 'monte-carlo-main.ts'), path.join(root, '.haulcase', 'bench-monte-carlo.cjs'), root);
  const r = spawnSync(process.execPath, ['--expose-gc', outfile, root, worker], { stdio: 'inherit' });
  if (r.status !== 0) throw new Error(`the Monte Carlo benchmark exited with ${r.status ?? r.signal}`);
}
