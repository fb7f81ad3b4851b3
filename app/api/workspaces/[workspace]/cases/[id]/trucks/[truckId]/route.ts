import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { evaluateStoredTruck } from '@/lib/cases/evaluate';
import { caseTruckParams } from '@/lib/cases/params';
import { readParams, route } from '@/lib/http';

/** GET: one truck of the case with the engine's per-period detail (cash flows by category, events). */
export const GET = route<{ workspace: string; id: string; truckId: string }>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const { id, truckId } = readParams(caseTruckParams, p);
  return NextResponse.json(await evaluateStoredTruck(access, id, truckId));
});
