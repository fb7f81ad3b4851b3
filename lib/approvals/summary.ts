import 'server-only';
import { db } from '@/lib/db';
import type { CaseRow } from './freeze';

/** The few facts the review page shows beside the approval panel; null for an unknown or foreign id. */
export async function fetchCaseSummary(workspaceId: number, id: number) {
  const k = db();
  const row: (CaseRow & { revisionOf: number | null }) | undefined = await k('business_cases').where({ id, workspaceId }).first();
  if (!row) return null;
  const set = row.assumptionSetId ? await k('assumption_sets').where({ id: row.assumptionSetId }).first('name') : null;
  let truckCount: number;
  // what the approvers decide on: the frozen record, else the snapshot taken at submission
  const stored = row.frozenCase ?? (row.status === 'submitted' ? row.submittedCase : null);
  if (stored) truckCount = (JSON.parse(stored).trucks ?? []).length;
  else {
    const selected = JSON.parse(row.selection || '[]') as unknown[];
    truckCount = selected.length || Number((await k('trucks').where({ workspaceId }).count<{ n: number }[]>({ n: '*' }))[0].n);
  }
  return { row, assumptionSet: (set?.name as string | undefined) ?? null, truckCount };
}
