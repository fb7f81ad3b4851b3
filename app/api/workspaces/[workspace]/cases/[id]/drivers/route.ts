import { NextResponse } from 'next/server';
import { evaluateNpvs } from '@/lib/engine';
import { readMetricOf } from '@/lib/engine/sensitivity';
import { route } from '@/lib/http';
import { describeDrivers } from '@/lib/risk/requests';
import { loadProposal } from '@/lib/risk/case-source';
import { loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';

/**
 * The drivers of the case (or of one truck with ?truck=ID), with base values
 * and units, and the case's trucks; beside them the headline the Monte Carlo
 * histogram marks: ΔNPV repower vs rebuild per truck and for the fleet, and
 * the fleet NPV on each truck's best policy, and the proposal's ΔNPV against
 * rebuilding every engine, in the case's own valuation; and the proposal
 * (each truck's policy, how many trucks it repowers, keeps and rebuilds).
 */
export const GET = route<CaseParams>(async (req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params);
  const truck = new URL(req.url).searchParams.get('truck') ?? undefined;
  const c = risk.caseFile;
  const truckId = truck && c.trucks.some((t) => t.id === truck) ? truck : undefined;
  const npvs = evaluateNpvs(c, { trusted: true });
  const proposal = await loadProposal(access, risk);
  const count = (p: string) => Object.values(proposal.policies).filter((x) => x === p).length;
  const deltas: Record<string, number> = {};
  let fleetDelta = 0;
  let fleetBest = 0;
  npvs.truckIds.forEach((id, i) => {
    deltas[id] = npvs.repower[i] - npvs.rebuild[i];
    fleetDelta += deltas[id];
    fleetBest += npvs[npvs.best[i]][i];
  });
  // the proposal's gain as the risk analyses read it: each truck on its policy, a repowered truck at its chosen
  // timing (read last: it writes the timed trucks' option npvs over their repower npvs)
  const proposalDelta = readMetricOf(c, npvs, { kind: 'proposal', policies: proposal.policies, timings: proposal.timings });
  return NextResponse.json({
    headline: { valuation: c.assumptions.valuation, fleetDeltaNpv: fleetDelta, fleetBestNpv: fleetBest, proposalDeltaNpv: proposalDelta, trucks: deltas },
    proposal: { policies: proposal.policies, timings: proposal.timings, repower: count('repower'), keep: count('keep'), rebuild: count('rebuild') },
    case: { id: risk.id, name: risk.name, status: risk.status, currency: c.currency },
    trucks: c.trucks.map((t) => ({ id: t.id, engineId: t.engineId, repowerOfferId: t.repowerOfferId })),
    truckId: truckId ?? null,
    drivers: describeDrivers(c, truckId),
  });
});
