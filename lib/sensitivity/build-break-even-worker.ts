/**
 * Build of the break-even worker bundle (scripts/build-workers.ts, tests and
 * the benchmark; never imported by the Next server: esbuild is a build tool).
 */
import path from 'node:path';
import { bundleForNode } from '@/lib/risk/build-worker';

export const BREAK_EVEN_WORKER_BUNDLE = path.join('.haulcase', 'break-even-worker.cjs');

export async function buildBreakEvenWorker(root = path.resolve(__dirname, '..', '..')): Promise<string> {
  return bundleForNode(path.join(root, 'lib/sensitivity/break-even-entry.ts'), path.join(root, BREAK_EVEN_WORKER_BUNDLE), root);
}
