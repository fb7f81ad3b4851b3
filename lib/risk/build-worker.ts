/**
 * Build of the Monte Carlo worker bundle with esbuild's JS API. Used by
 * scripts/build-workers.ts, the tests and the benchmark; never imported by
 * the Next server (esbuild is a build tool).
 */
import path from 'node:path';
import { build } from 'esbuild';

export const WORKER_BUNDLE = path.join('.haulcase', 'mc-worker.cjs');

export async function buildMonteCarloWorker(root = path.resolve(__dirname, '..', '..')): Promise<string> {
  const outfile = path.join(root, WORKER_BUNDLE);
  await build({
    entryPoints: [path.join(root, 'lib/risk/worker-entry.ts')],
    outfile,
    bundle: true,
    platform: 'node',
    target: 'node20',
    format: 'cjs',
    alias: { '@': root },
    logLevel: 'warning',
  });
  return outfile;
}
