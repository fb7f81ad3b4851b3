import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { evaluateStoredCase } from '@/lib/cases/evaluate';
import { parseCaseId } from '@/lib/cases/params';
import { route } from '@/lib/http';

/**
 * GET: the case evaluated on the server — `result` is the engine's
 * case-result/1, beside it the ranking, capital plan, swap schedule, fleet
 * summary and each truck's event timeline. 422 lists what stops evaluation.
 */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const { workspace, id } = await params;
  const access = await requireMember(workspace, CAN.read);
  return NextResponse.json(await evaluateStoredCase(access, parseCaseId(id)));
});
