import type { runBreakEven } from '@/lib/risk/requests';
import type { CaseFile } from '@/lib/validation/case';

/** What the break-even worker is sent and answers (structured clone: plain data only). */
export interface BreakEvenJob {
  caseFile: CaseFile;
  /** the proposal's policy per truck, for the proposal metric (null otherwise) */
  proposal: Parameters<typeof runBreakEven>[1];
  body: Parameters<typeof runBreakEven>[2];
}

export type BreakEvenReply =
  | { ok: true; value: ReturnType<typeof runBreakEven> }
  /** kind http: a refused request (its status, message and problems); error: anything else (a bug: logged, answered 500) */
  | { ok: false; kind: 'http' | 'error'; status: number; message: string; problems?: { path: string; message: string }[] };
