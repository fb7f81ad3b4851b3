/**
 * The repower's case without its productivity gain: the same case with every
 * repower offer's `productivityGain` set to 0, evaluated by the same engine
 * (same valuation). A small gain in tonnes per hour is worth a great deal of
 * margin over a horizon, so the reviewer sees ΔNPV with and without it. Pure.
 */
import { evaluateNpvs, type CaseFile } from '@/lib/engine';

/** A copy of a validated case with no productivity gain on any repower offer (the input is left as it was). */
export function withoutProductivityGain(file: CaseFile, truckIds?: readonly string[]): CaseFile {
  const keep = truckIds ? new Set(truckIds) : null;
  return {
    ...file,
    repowerOffers: file.repowerOffers.map((o) => ({ ...o, productivityGain: 0 })),
    trucks: keep ? file.trucks.filter((t) => keep.has(t.id)) : file.trucks,
  };
}

export interface DeltaWithoutGain {
  /** ΔNPV repower vs rebuild of each truck with no productivity gain */
  trucks: Record<string, number>;
  /** Σ over the trucks */
  fleet: number;
  /** some offer these trucks use carries a productivity gain (else both figures are the same) */
  anyGain: boolean;
}

/** ΔNPV repower vs rebuild per truck and for the fleet, every offer's productivity gain set to 0 (optionally of some trucks only). */
export function deltaNpvWithoutGain(file: CaseFile, truckIds?: readonly string[]): DeltaWithoutGain {
  const copy = withoutProductivityGain(file, truckIds);
  const npvs = evaluateNpvs(copy, { trusted: true });
  const used = new Set(copy.trucks.map((t) => t.repowerOfferId));
  const trucks: Record<string, number> = {};
  let fleet = 0;
  npvs.truckIds.forEach((id, i) => {
    const d = npvs.repower[i] - npvs.rebuild[i];
    trucks[id] = d;
    fleet += d;
  });
  return { trucks, fleet, anyGain: file.repowerOffers.some((o) => used.has(o.id) && o.productivityGain > 0) };
}
