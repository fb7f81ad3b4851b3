/**
 * Evaluate a case and stream its workbook into a file: what the workbook
 * worker runs (workbook-entry.ts), and the request thread where the worker
 * bundle is missing. No server-only imports: it is bundled into the worker.
 */
import { createWriteStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { finished } from 'node:stream/promises';
import { evaluateCaseDetailed } from '@/lib/engine/evaluate';
import type { CaseFile } from '@/lib/validation/case';
import type { WorkbookMeta } from './types';
import { writeWorkbook } from './workbook';

/** Writes the workbook to `file`; answers its size in bytes. */
export async function writeWorkbookFile(caseFile: CaseFile, meta: WorkbookMeta, file: string): Promise<number> {
  const evaluated = evaluateCaseDetailed(caseFile, { trusted: true });
  const out = createWriteStream(file);
  try {
    await writeWorkbook({ caseFile, evaluated, meta }, out);
    await finished(out);
  } catch (err) {
    out.destroy();
    throw err;
  }
  return (await stat(file)).size;
}
