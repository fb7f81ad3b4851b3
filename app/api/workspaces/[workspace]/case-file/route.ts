import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { importCaseFile } from '@/lib/db/queries/case-file-import';
import { BODY_LIMITS, invalid, notFound, readJson, readQueryId, route } from '@/lib/http';
import { validateCase } from '@/lib/validation/case';
import { caseFileTextProblems } from '@/lib/validation/fleet';

type P = { workspace: string };

/**
 * GET ?assumptionSetId=N: the workspace's register, engines, offers and that
 * assumption set as a case/1 file (any member). The case is named after the set,
 * so uploading it again updates the same set.
 */
export const GET = route<P>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  const setId = readQueryId(new URL(req.url).searchParams, 'assumptionSetId', 'must be an assumption set id (a whole number from 1 to 999,999,999)');
  if (setId === null) throw invalid([{ path: 'assumptionSetId', message: 'Choose an assumption set (query parameter assumptionSetId).' }]);
  const set = await db()('assumption_sets').where({ id: setId, workspaceId: access.workspace.id }).first('id', 'name');
  if (!set) throw notFound('No such assumption set in this workspace.');
  const file = await buildCaseFile(access.workspace.id, { name: set.name, assumptionSetId: set.id, includeAll: true });
  const safe = `${access.workspace.slug}-${String(set.name).toLowerCase().replace(/[^a-z0-9]+/g, '-')}`.replace(/-+$/, '');
  return new NextResponse(`${JSON.stringify(file, null, 2)}\n`, {
    headers: { 'content-type': 'application/json; charset=utf-8', 'content-disposition': `attachment; filename="${safe}.case.json"` },
  });
});

/**
 * POST a case/1 document (JSON body): validated as the engine validates it, then
 * upserted (engines and offers by key, trucks by unit number, assumptions as the
 * set named like the case) in one transaction; any problem saves nothing.
 */
export const POST = route<P>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.edit);
  const v = validateCase(await readJson(req));
  if (!v.ok) throw invalid(v.problems, `The case file has ${v.problems.length} problem(s); nothing was saved.`);
  if (v.value.currency !== access.workspace.currency) {
    throw invalid([{ path: 'currency', message: `is ${v.value.currency} but this workspace reports in ${access.workspace.currency}` }], 'The case file is in another currency; nothing was saved.');
  }
  // What is stored follows the register's text rules (no formula-looking text; its column widths).
  const text = caseFileTextProblems(v.value);
  if (text.length) throw invalid(text, `The case file has ${text.length} problem(s) in its names and ids; nothing was saved.`);
  const counts = await db().transaction((trx) => importCaseFile(trx, access, v.value));
  return NextResponse.json({ name: v.value.name, ...counts });
}, { limit: BODY_LIMITS.caseFile });
