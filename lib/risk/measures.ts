/**
 * What a fleet risk analysis measures, and how the pages name it. Pure (the
 * client and the server both read it). The proposal is the case's answer
 * (lib/cases/proposal.ts), so it is the default; repowering every truck and
 * the best mix stay as comparisons, labelled as such.
 */
export type FleetMeasure = 'proposal' | 'fleet-delta' | 'fleet-best';

export const FLEET_MEASURES: readonly FleetMeasure[] = ['proposal', 'fleet-delta', 'fleet-best'];

export const DEFAULT_FLEET_MEASURE: FleetMeasure = 'proposal';

export const MEASURE_LABELS: Record<FleetMeasure, string> = {
  proposal: 'ΔNPV of the proposal against rebuilding every engine',
  'fleet-delta': 'Comparison: ΔNPV of repowering every truck against rebuilding every engine',
  'fleet-best': 'Comparison: NPV of the best mix (each truck on its best policy)',
};

/**
 * The measure a stored Monte Carlo run was asked for. Runs stored before the
 * proposal existed name none; they showed "repower every truck".
 */
export function runMeasure(spec: { measure?: FleetMeasure } | null | undefined): FleetMeasure {
  return spec?.measure ?? 'fleet-delta';
}

interface FleetSummaries<S> {
  deltaNpv: S;
  bestNpv: S;
  /** Σ over trucks of npv(proposal's policy) − npv(rebuild); runs made before the proposal measure have none */
  proposalNpv?: S;
}

/** The fleet summary of a run for a measure (null: the run did not compute it). */
export function fleetSummary<S>(fleet: FleetSummaries<S>, measure: FleetMeasure): S | null {
  if (measure === 'fleet-delta') return fleet.deltaNpv;
  if (measure === 'fleet-best') return fleet.bestNpv;
  return fleet.proposalNpv ?? null;
}
