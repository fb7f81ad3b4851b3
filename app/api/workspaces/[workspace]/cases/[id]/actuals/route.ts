import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParams, readParams, route } from '@/lib/http';
import { loadPlanVsActual } from '@/lib/readings/plan-vs-actual-load';

/**
 * GET: an approved case's plan against actual (any member): per truck and
 * fleet, by month, the readings after its approval against its frozen
 * forecast (lib/readings/plan-vs-actual.ts). 404 with a plain message for an
 * unknown case or one that is not approved.
 */
export const GET = route<{ workspace: string; id: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  return NextResponse.json(await loadPlanVsActual(access, readParams(idParams, p).id));
});
