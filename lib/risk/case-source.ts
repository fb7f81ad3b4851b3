import 'server-only';
/**
 * The case/1 a risk analysis runs on: a business case's frozen file once
 * approved (risk on the numbers that were approved), else built from stored
 * data with the case's trucks, offers and assumption set; validated.
 */
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { db } from '@/lib/db';
import { invalid, notFound } from '@/lib/http';
import { validateCase, type CaseFile } from '@/lib/validation/case';

export interface RiskCase {
  id: number;
  name: string;
  status: string;
  caseFile: CaseFile;
}

/** Route param → case id, or 404 for anything that is not a positive whole number. */
export function parseCaseId(raw: string): number {
  const id = Number(raw);
  if (!Number.isInteger(id) || id <= 0) throw notFound('No such business case.');
  return id;
}

export async function loadRiskCase(workspaceId: number, caseId: number): Promise<RiskCase> {
  const row = await db()('business_cases').where({ id: caseId, workspaceId }).first();
  if (!row) throw notFound('No such business case.');
  let file: unknown;
  if (row.frozenCase) {
    file = JSON.parse(row.frozenCase);
  } else {
    if (row.assumptionSetId == null) throw invalid([{ path: 'assumptionSetId', message: 'The case has no assumption set: choose one before running a sensitivity.' }]);
    const selection = JSON.parse(row.selection || '[]') as { truckId: number; repowerOfferId: number | null }[];
    const offerOverrides = Object.fromEntries(selection.map((s) => [s.truckId, s.repowerOfferId]));
    file = await buildCaseFile(workspaceId, {
      name: row.name,
      assumptionSetId: row.assumptionSetId,
      truckIds: selection.length ? selection.map((s) => s.truckId) : undefined,
      offerOverrides,
    });
  }
  const v = validateCase(file);
  if (!v.ok) throw invalid(v.problems.map((p) => ({ path: `case.${p.path}`, message: p.message })), 'The stored data does not make a valid case.');
  return { id: row.id, name: row.name, status: row.status, caseFile: v.value };
}
