import type { CaseFile } from '@/lib/validation/case';
import type { WorkbookMeta } from './types';

/** What the workbook worker is sent (structured clone: plain data only): the case, the words and tables beside it, and the file to write. */
export interface WorkbookJob {
  /** the export's number: the worker answers each job with it */
  id: number;
  caseFile: CaseFile;
  meta: WorkbookMeta;
  /** absolute path of the .xlsx to write */
  file: string;
}

export type WorkbookReply =
  | { ok: true; bytes: number }
  /** kind http: a case the engine refuses (422, its problems); error: anything else (a bug: logged, answered 500) */
  | { ok: false; kind: 'http' | 'error'; status: number; message: string; problems?: { path: string; message: string }[] };
