import { NextResponse } from 'next/server';
import { versionFromQuery } from '@/lib/api/crud';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { toSummaryDto } from '@/lib/cases/evaluate';
import { deleteCase, fetchCase, updateCase } from '@/lib/db/queries/cases';
import { idParams, notFound, parseOr422, readJson, readParams, route } from '@/lib/http';
import { updateCaseSchema } from '@/lib/validation/business-case';

type P = { workspace: string; id: string };

/** GET: one case with its selection (every member reads). */
export const GET = route<P>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const c = await fetchCase(access.workspace.id, readParams(idParams, p).id);
  if (!c) throw notFound('No such business case in this workspace.');
  return NextResponse.json({ case: toSummaryDto(c), selection: c.selection });
});

/** PATCH: rename, change assumptions/selection or the plan settings; `version` must match (409 otherwise). */
export const PATCH = route<P>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id: caseId } = readParams(idParams, p);
  const input = parseOr422(updateCaseSchema, await readJson(req));
  return NextResponse.json({ case: toSummaryDto(await updateCase(access, caseId, input)) });
});

/** DELETE ?version=N: removes a draft case. */
export const DELETE = route<P>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id: caseId } = readParams(idParams, p);
  await deleteCase(access, caseId, versionFromQuery(req));
  return new NextResponse(null, { status: 204 });
});
