/**
 * Build of the workbook worker bundle (scripts/build-workers.ts, tests and
 * the benchmark; never imported by the Next server: esbuild is a build tool).
 */
import path from 'node:path';
import { bundleForNode } from '@/lib/risk/build-worker';

export const WORKBOOK_WORKER_BUNDLE = path.join('.haulcase', 'workbook-worker.cjs');

export async function buildWorkbookWorker(root = path.resolve(__dirname, '..', '..')): Promise<string> {
  return bundleForNode(path.join(root, 'lib/export/workbook-entry.ts'), path.join(root, WORKBOOK_WORKER_BUNDLE), root);
}
