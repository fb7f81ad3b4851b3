import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { toSummaryDto } from '@/lib/cases/evaluate';
import { parseCaseId } from '@/lib/cases/params';
import { copyCase } from '@/lib/db/queries/cases';
import { parseOr422, route } from '@/lib/http';
import { copyCaseSchema } from '@/lib/validation/business-case';

/** POST: a new draft with the same assumptions, selection and plan (any status may be copied). */
export const POST = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const { workspace, id } = await params;
  const access = await requireMember(workspace, CAN.edit);
  const caseId = parseCaseId(id);
  const text = await req.text();
  let body: unknown = {};
  if (text.trim()) {
    try {
      body = JSON.parse(text);
    } catch {
      body = null;
    }
  }
  const input = parseOr422(copyCaseSchema, body);
  return NextResponse.json({ case: toSummaryDto(await copyCase(access, caseId, input.name)) }, { status: 201 });
});
