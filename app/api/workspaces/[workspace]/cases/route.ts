import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { toSummaryDto } from '@/lib/cases/evaluate';
import { createCase, listCases } from '@/lib/db/queries/cases';
import { parseOr422, readJson, route } from '@/lib/http';
import { createCaseSchema } from '@/lib/validation/business-case';

type P = { workspace: string };

/** GET: the workspace's business cases (every member reads). */
export const GET = route<P>(async (_req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  return NextResponse.json({ cases: (await listCases(access.workspace.id)).map(toSummaryDto) });
});

/** POST: a new draft case (analysts and admins). */
export const POST = route<P>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.edit);
  const input = parseOr422(createCaseSchema, await readJson(req));
  return NextResponse.json({ case: toSummaryDto(await createCase(access, input)) }, { status: 201 });
});
