import { NextResponse } from 'next/server';
import { decideCase } from '@/lib/approvals/service';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParams, parseOr422, readJson, readParams, route } from '@/lib/http';
import { decisionSchema } from '@/lib/validation/approval';

/** POST: approve, reject or send back a submitted case, with a comment; mails the submitter. Approvers and admins. */
export const POST = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.decide);
  const { id: caseId } = readParams(idParams, p);
  const body = parseOr422(decisionSchema, await readJson(req));
  return NextResponse.json(await decideCase(access, caseId, body));
});
