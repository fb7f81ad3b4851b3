import { NextResponse } from 'next/server';
import { submitCase } from '@/lib/approvals/service';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { parseOr422, readJson, route } from '@/lib/http';
import { idParam, submitSchema } from '@/lib/validation/approval';

/** POST: submit a draft (or returned) case for approval; mails the approvers. Analysts and admins. */
export const POST = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const { workspace, id } = await params;
  const access = await requireMember(workspace, CAN.edit);
  const caseId = parseOr422(idParam, id);
  const body = parseOr422(submitSchema, await readJson(req));
  return NextResponse.json(await submitCase(access, caseId, body));
});
