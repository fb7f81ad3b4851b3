import type { runBreakEven } from '@/lib/risk/requests';
import type { CaseFile } from '@/lib/validation/case';

/** What the break-even worker is sent and answers (structured clone: plain data only). */
export interface BreakEvenJob {
  caseFile: CaseFile;
  body: Parameters<typeof runBreakEven>[1];
}

export type BreakEvenReply =
  | { ok: true; value: ReturnType<typeof runBreakEven> }
  /** kind http: a refused request (its status, message and problems); error: anything else (a bug: logged, answered 500) */
  | { ok: false; kind: 'http' | 'error'; status: number; message: string; problems?: { path: string; message: string }[] };
