/**
 * Fleet roll-up (MODEL.md section 10): npv, fuel litres, CO2 tonnes and
 * capital summed over the trucks for each policy, and `best` summing each
 * truck's best policy.
 */
import type { FleetFigure, FleetResult, PolicyResult, TruckResult } from './types';

/** Capital spent on the repower, undiscounted, as a positive amount. */
export function capitalSpent(result: PolicyResult): number {
  let sum = 0;
  for (const entry of result.breakdown) sum -= entry.capital;
  return sum;
}

function figure(trucks: readonly TruckResult[], read: (r: PolicyResult) => number): FleetFigure {
  const out: FleetFigure = { keep: 0, rebuild: 0, repower: 0, best: 0 };
  for (const t of trucks) {
    out.keep += read(t.options.keep);
    out.rebuild += read(t.options.rebuild);
    out.repower += read(t.options.repower);
    out.best += read(t.options[t.best]);
  }
  return out;
}

/**
 * @example rollUpFleet([]) // every figure 0
 */
export function rollUpFleet(trucks: readonly TruckResult[]): FleetResult {
  return {
    npv: figure(trucks, (r) => r.npv),
    fuelLitres: figure(trucks, (r) => r.fuelLitres),
    co2Tonnes: figure(trucks, (r) => r.co2Tonnes),
    capital: figure(trucks, capitalSpent),
  };
}
