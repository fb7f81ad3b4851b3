import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { evaluateStoredProgramme } from '@/lib/cases/programme';
import { idParams, readParams, route } from '@/lib/http';

/**
 * GET: the case's fleet programme — each truck's chosen repower timing under
 * the plan's budgets and shop capacity, solved exactly (lib/cases/programme.ts),
 * with each truck's alternatives, the cost of forced delays and the value of
 * one more unit of each binding constraint. 422 lists what stops evaluation.
 */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  return NextResponse.json(await evaluateStoredProgramme(access, readParams(idParams, p).id));
});
