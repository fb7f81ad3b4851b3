import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { fetchDecisionSummary } from '@/lib/cases/decision';
import { idParams, readParams, route } from '@/lib/http';

/**
 * GET: the decision summary (lib/cases/decision-summary.ts): from the frozen
 * record once approved, the submitted snapshot while submitted, the live fleet
 * data for a draft (`source` says which). Any member may read it; 422 lists
 * what stops a draft from being evaluated.
 */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  return NextResponse.json(await fetchDecisionSummary(access, readParams(idParams, p).id));
});
