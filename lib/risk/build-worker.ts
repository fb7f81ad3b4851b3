/**
 * Build of the Monte Carlo worker bundle with esbuild's JS API. Used by
 * scripts/build-workers.ts, the tests and the benchmark; never imported by
 * the Next server (esbuild is a build tool).
 */
import path from 'node:path';
import { build } from 'esbuild';

export const WORKER_BUNDLE = path.join('.haulcase', 'mc-worker.cjs');

/** One TypeScript entry bundled into a CommonJS file plain Node can start ('@/…' resolved from `root`). */
export async function bundleForNode(entry: string, outfile: string, root: string): Promise<string> {
  await build({
    entryPoints: [entry],
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

export async function buildMonteCarloWorker(root = path.resolve(__dirname, '..', '..')): Promise<string> {
  return bundleForNode(path.join(root, 'lib/risk/worker-entry.ts'), path.join(root, WORKER_BUNDLE), root);
}
