import { NextResponse } from 'next/server';
import { evaluateNpvs } from '@/lib/engine';
import { route } from '@/lib/http';
import { describeDrivers } from '@/lib/risk/requests';
import { loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';

/**
 * The drivers of the case (or of one truck with ?truck=ID), with base values
 * and units, and the case's trucks; beside them the headline the Monte Carlo
 * histogram marks: ΔNPV repower vs rebuild per truck and for the fleet, and
 * the fleet NPV on each truck's best policy, in the case's own valuation.
 */
export const GET = route<CaseParams>(async (req, { params }) => {
  const { risk } = await loadCaseForRoute(params);
  const truck = new URL(req.url).searchParams.get('truck') ?? undefined;
  const c = risk.caseFile;
  const truckId = truck && c.trucks.some((t) => t.id === truck) ? truck : undefined;
  const npvs = evaluateNpvs(c, { trusted: true });
  const deltas: Record<string, number> = {};
  let fleetDelta = 0;
  let fleetBest = 0;
  npvs.truckIds.forEach((id, i) => {
    deltas[id] = npvs.repower[i] - npvs.rebuild[i];
    fleetDelta += deltas[id];
    fleetBest += npvs[npvs.best[i]][i];
  });
  return NextResponse.json({
    headline: { valuation: c.assumptions.valuation, fleetDeltaNpv: fleetDelta, fleetBestNpv: fleetBest, trucks: deltas },
    case: { id: risk.id, name: risk.name, status: risk.status, currency: c.currency },
    trucks: c.trucks.map((t) => ({ id: t.id, engineId: t.engineId, repowerOfferId: t.repowerOfferId })),
    truckId: truckId ?? null,
    drivers: describeDrivers(c, truckId),
  });
});
