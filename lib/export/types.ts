/** What the workbook export needs besides the case itself. */
import type { CaseFile } from '@/lib/validation/case';
import type { DetailedCaseResult } from '@/lib/engine/types';

export interface ApprovalStamp {
  approvedBy: string;
  approvedAt: string;
  /** SHA-256 of the frozen case and result */
  hash: string;
}

/** A table for the ranking and capital plan sheet: plain cells, written as values. */
export interface PlanTable {
  title: string;
  columns: { header: string; format?: string; width?: number }[];
  rows: (string | number | null)[][];
}

export interface WorkbookMeta {
  workspaceName?: string;
  status?: string;
  assumptionSetName?: string;
  /** shown on the cover; defaults to now */
  generatedAt?: Date;
  approval?: ApprovalStamp | null;
  /** words people typed beside the figures, keyed by the case file's ids */
  trucks?: Record<string, { payloadClass?: string; notes?: string }>;
  engines?: Record<string, { name?: string; notes?: string }>;
  offers?: Record<string, { supplier?: string; notes?: string }>;
  /** ranking, capital plan, schedule: one sheet when given */
  plan?: PlanTable[] | null;
}

export interface WorkbookInput {
  caseFile: CaseFile;
  evaluated: DetailedCaseResult;
  meta: WorkbookMeta;
}
