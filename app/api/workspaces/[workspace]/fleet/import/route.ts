import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { BODY_LIMITS, invalid, readForm, route } from '@/lib/http';
import { IMPORT_LIMITS } from '@/lib/import/columns';
import { commitFleetImport, loadImportLookups } from '@/lib/import/fleet-import';
import { FileProblem, readTable } from '@/lib/import/read-table';
import { planFleetImport, type FleetImportPlan } from '@/lib/import/validate-fleet';

const summary = (fileName: string, plan: FleetImportPlan) => ({
  fileName,
  ok: plan.problems.length === 0,
  creates: plan.creates,
  updates: plan.updates,
  rowProblems: plan.problems,
  rows: plan.rows.map(({ row, unitNumber, action }) => ({ row, unitNumber, action })),
});

/**
 * POST multipart: `file` (CSV or XLSX, ≤ 5 MB, ≤ 10,000 rows) and `mode`:
 * `preview` (default) answers what would be created or updated and every
 * row's problems, saving nothing; `commit` saves all rows in one transaction,
 * or nothing at all (422 with the problems) if any row has a problem.
 */
export const POST = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.edit);
  const form = await readForm(req, 'Send the file as multipart/form-data with a "file" field.');
  const file = form.get('file');
  const mode = String(form.get('mode') ?? 'preview');
  if (mode !== 'preview' && mode !== 'commit') throw invalid([{ path: 'mode', message: 'must be "preview" or "commit"' }]);
  if (!file || typeof file === 'string') throw invalid([{ path: 'file', message: 'Choose a CSV or XLSX file to import.' }]);
  // (the body itself is capped at the file limit plus the multipart framing by route())
  if (file.size > IMPORT_LIMITS.maxBytes) throw invalid([{ path: 'file', message: `The file is ${(file.size / 1048576).toFixed(1)} MB; the limit is 5 MB.` }], 'The file is too large.');

  let table;
  try {
    table = await readTable(file.name, new Uint8Array(await file.arrayBuffer()));
  } catch (e) {
    if (e instanceof FileProblem) throw invalid([{ path: 'file', message: e.message }], e.message);
    throw e;
  }
  const wsId = access.workspace.id;
  if (mode === 'preview') {
    const plan = planFleetImport(table, await loadImportLookups(db(), wsId), access.workspace.settings.numberFormat);
    return NextResponse.json(summary(file.name, plan));
  }
  // Plan and write inside one transaction so the unit numbers matched are the ones updated.
  const result = await db().transaction(async (trx) => {
    const plan = planFleetImport(table, await loadImportLookups(trx, wsId), access.workspace.settings.numberFormat);
    if (plan.problems.length) return { plan, saved: null };
    return { plan, saved: await commitFleetImport(trx, access, plan, file.name) };
  });
  if (!result.saved) {
    return NextResponse.json(
      {
        ...summary(file.name, result.plan),
        error: `Nothing was imported: ${result.plan.problems.length} problem(s) in the file.`,
        problems: result.plan.problems.map((p) => ({ path: `row ${p.row}, ${p.column}`, message: p.message })),
      },
      { status: 422 },
    );
  }
  return NextResponse.json({ ...summary(file.name, result.plan), ...result.saved });
}, { body: 'multipart', limit: BODY_LIMITS.fleetImport });
