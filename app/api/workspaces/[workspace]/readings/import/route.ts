import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { commitReadingsImport, loadReadingLookups } from '@/lib/db/queries/readings';
import { BODY_LIMITS, invalid, readForm, route } from '@/lib/http';
import { IMPORT_LIMITS } from '@/lib/import/columns';
import { FileProblem, readTable } from '@/lib/import/read-table';
import { planReadingsImport, type ReadingImportPlan } from '@/lib/readings/import-plan';

const summary = (fileName: string, plan: ReadingImportPlan) => ({
  fileName,
  ok: plan.problems.length === 0,
  creates: plan.creates,
  replaces: plan.replaces,
  rowProblems: plan.problems,
});

/**
 * POST multipart: `file` (CSV or XLSX, the fleet import's limits: ≤ 5 MB,
 * ≤ 10,000 rows, ≤ 100 columns), `mode` (`preview`, the default, saves
 * nothing; `commit`) and `duplicates` (`refuse`, the default: a month already
 * saved for a truck is a row error; `replace`: it is overwritten). A commit
 * saves every row in one transaction with its audit row, or nothing (422 with
 * every row's problems).
 */
export const POST = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.edit);
  const form = await readForm(req, 'Send the file as multipart/form-data with a "file" field.');
  const file = form.get('file');
  const mode = String(form.get('mode') ?? 'preview');
  const duplicates = String(form.get('duplicates') ?? 'refuse');
  const problems = [];
  if (mode !== 'preview' && mode !== 'commit') problems.push({ path: 'mode', message: 'must be "preview" or "commit"' });
  if (duplicates !== 'refuse' && duplicates !== 'replace') problems.push({ path: 'duplicates', message: 'must be "refuse" or "replace"' });
  if (!file || typeof file === 'string') problems.push({ path: 'file', message: 'Choose a CSV or XLSX file to import.' });
  if (problems.length) throw invalid(problems);
  const f = file as File;
  if (f.size > IMPORT_LIMITS.maxBytes) throw invalid([{ path: 'file', message: `The file is ${(f.size / 1048576).toFixed(1)} MB; the limit is 5 MB.` }], 'The file is too large.');

  let table;
  try {
    table = await readTable(f.name, new Uint8Array(await f.arrayBuffer()));
  } catch (e) {
    if (e instanceof FileProblem) throw invalid([{ path: 'file', message: e.message }], e.message);
    throw e;
  }
  const wsId = access.workspace.id;
  const dup = duplicates as 'refuse' | 'replace';
  if (mode === 'preview') {
    return NextResponse.json(summary(f.name, planReadingsImport(table, await loadReadingLookups(db(), wsId), dup, new Date(), access.workspace.settings.numberFormat)));
  }
  const result = await db().transaction(async (trx) => {
    const plan = planReadingsImport(table, await loadReadingLookups(trx, wsId), dup, new Date(), access.workspace.settings.numberFormat);
    if (plan.problems.length) return { plan, saved: null };
    return { plan, saved: await commitReadingsImport(trx, access, plan, f.name) };
  });
  if (!result.saved) {
    return NextResponse.json(
      {
        ...summary(f.name, result.plan),
        error: `Nothing was imported: ${result.plan.problems.length} problem(s) in the file.`,
        problems: result.plan.problems.map((p) => ({ path: `row ${p.row}, ${p.column}`, message: p.message })),
      },
      { status: 422 },
    );
  }
  return NextResponse.json({ ...summary(f.name, result.plan), ...result.saved });
}, { body: 'multipart', limit: BODY_LIMITS.fleetImport });
