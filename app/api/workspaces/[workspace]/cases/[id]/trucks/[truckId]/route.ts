import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { evaluateStoredTruck } from '@/lib/cases/evaluate';
import { parseCaseId, parseTruckParam } from '@/lib/cases/params';
import { route } from '@/lib/http';

/** GET: one truck of the case with the engine's per-period detail (cash flows by category, events). */
export const GET = route<{ workspace: string; id: string; truckId: string }>(async (_req, { params }) => {
  const { workspace, id, truckId } = await params;
  const access = await requireMember(workspace, CAN.read);
  return NextResponse.json(await evaluateStoredTruck(access, parseCaseId(id), parseTruckParam(truckId)));
});
