import { NextResponse } from 'next/server';
import { route } from '@/lib/http';
import { describeDrivers } from '@/lib/risk/requests';
import { loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';

/** The drivers of the case (or of one truck with ?truck=ID), with base values and units, and the case's trucks. */
export const GET = route<CaseParams>(async (req, { params }) => {
  const { risk } = await loadCaseForRoute(params);
  const truck = new URL(req.url).searchParams.get('truck') ?? undefined;
  const c = risk.caseFile;
  const truckId = truck && c.trucks.some((t) => t.id === truck) ? truck : undefined;
  return NextResponse.json({
    case: { id: risk.id, name: risk.name, status: risk.status, currency: c.currency },
    trucks: c.trucks.map((t) => ({ id: t.id, engineId: t.engineId, repowerOfferId: t.repowerOfferId })),
    truckId: truckId ?? null,
    drivers: describeDrivers(c, truckId),
  });
});
