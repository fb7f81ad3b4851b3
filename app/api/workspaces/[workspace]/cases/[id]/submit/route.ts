import { NextResponse } from 'next/server';
import { submitCase } from '@/lib/approvals/service';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParams, parseOr422, readJson, readParams, route } from '@/lib/http';
import { submitSchema } from '@/lib/validation/approval';

/** POST: submit a draft (or returned) case for approval; mails the approvers. Analysts and admins. */
export const POST = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id: caseId } = readParams(idParams, p);
  const body = parseOr422(submitSchema, await readJson(req));
  return NextResponse.json(await submitCase(access, caseId, body));
});
