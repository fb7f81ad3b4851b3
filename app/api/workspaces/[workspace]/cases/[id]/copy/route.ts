import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { toSummaryDto } from '@/lib/cases/evaluate';
import { copyCase } from '@/lib/db/queries/cases';
import { idParams, parseOr422, readParams, route } from '@/lib/http';
import { copyCaseSchema } from '@/lib/validation/business-case';

/** POST: a new draft with the same assumptions, selection and plan (any status may be copied). */
export const POST = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id: caseId } = readParams(idParams, p);
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
