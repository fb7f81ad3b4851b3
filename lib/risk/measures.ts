/**
 * What a risk analysis measures, and how the pages name it. Pure (the client
 * and the server both read it). The proposal is the case's answer
 * (lib/cases/proposal.ts), so it is the default of a fleet analysis;
 * repowering every truck and the best mix stay as comparisons, labelled as such.
 */
export type FleetMeasure = 'proposal' | 'fleet-delta' | 'fleet-best';
/** What a Monte Carlo run is read on: a fleet measure, or one truck's ΔNPV repower vs rebuild. */
export type RunMeasure = FleetMeasure | 'truck-delta';

export const FLEET_MEASURES: readonly FleetMeasure[] = ['proposal', 'fleet-delta', 'fleet-best'];

export const DEFAULT_FLEET_MEASURE: FleetMeasure = 'proposal';

export const MEASURE_LABELS: Record<FleetMeasure, string> = {
  proposal: 'ΔNPV of the proposal against rebuilding every engine',
  'fleet-delta': 'Comparison: ΔNPV of repowering every truck against rebuilding every engine',
  'fleet-best': 'Comparison: NPV of the best mix (each truck on its best policy)',
};

/** The label of a run's measure (a truck's names the truck). */
export function measureLabel(measure: RunMeasure, truckId?: string | null): string {
  return measure === 'truck-delta' ? `ΔNPV repower vs rebuild, truck ${truckId ?? '?'}` : MEASURE_LABELS[measure];
}

/** Δnpv measures: below zero is a loss against rebuilding. */
export function isDeltaMeasure(measure: RunMeasure): boolean {
  return measure !== 'fleet-best';
}

/**
 * The measure a stored Monte Carlo run was asked for. Runs stored before the
 * proposal existed name none; they showed "repower every truck".
 */
export function runMeasure(spec: { measure?: RunMeasure } | null | undefined): RunMeasure {
  return spec?.measure ?? 'fleet-delta';
}

interface RunSummaries<S> {
  trucks: { id: string; deltaNpv: S }[];
  fleet: {
    deltaNpv: S;
    bestNpv: S;
    /** Σ over trucks of npv(proposal's policy) − npv(rebuild); runs made before the proposal measure have none */
    proposalNpv?: S;
  };
}

/** The summary of a run's result for a measure (null: the run did not compute it). */
export function measureSummary<S>(result: RunSummaries<S>, measure: RunMeasure, truckId?: string | null): S | null {
  if (measure === 'truck-delta') return result.trucks.find((t) => t.id === truckId)?.deltaNpv ?? null;
  if (measure === 'fleet-delta') return result.fleet.deltaNpv;
  if (measure === 'fleet-best') return result.fleet.bestNpv;
  return result.fleet.proposalNpv ?? null;
}
