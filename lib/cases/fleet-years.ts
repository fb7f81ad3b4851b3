/**
 * The fleet year by year, pure: capital, cash flow, fuel, CO2 and cost per
 * tonne of the best mix (each truck on its best policy, `TruckResult.best`, as
 * the fleet summary uses) against rebuilding every engine.
 *
 * For period y (0 = now, 1..N years) and a set of policies p(truck):
 * - capital_y = Σ −breakdown_y.capital (repower capital, positive, undiscounted)
 * - cashFlow_y = Σ cashFlow_y (after tax, nominal, costs negative)
 * - fuel_y = Σ fuelLitres_y (L), co2_y = Σ co2Tonnes_y (t), tonnes_y = Σ tonnes_y
 * - costPerTonne_y = −Σ (fuel + carbon + lube + overhauls + failures + capital
 *   + lostMargin)_y / tonnes_y: the year's operating and capital costs before
 *   tax, nominal, per tonne hauled; null when nothing is hauled (year 0).
 * Trucks have horizons of their own: a truck adds to the years it runs only.
 * `partYear` marks a year in which some truck runs fewer hours than its
 * annual hours (its last, part year), so a drop there is not read as a collapse.
 *
 * Worked example (tests/unit/cases/fleet-years.test.ts): truck A best repower,
 * year 1: capital −500, fuel −100, cash flow −600, 1,000 L, 2.7 t CO2,
 * 200 t hauled; rebuild the same year −150 cash (fuel −150), 1,200 L, 3.24 t,
 * 200 t → best: capital 500, cost per tonne (500 + 100)/200 = 3; rebuild 0.75.
 */
import type { BreakdownEntry, CaseResult, PolicyKey, TruckDetail } from '@/lib/engine/types';

export type FleetYearFigures = { capital: number; cashFlow: number; fuelLitres: number; co2Tonnes: number; tonnes: number; costPerTonne: number | null };
export type FleetYear = { year: number; best: FleetYearFigures; rebuild: FleetYearFigures; partYear: boolean };

const COSTS: Array<keyof BreakdownEntry> = ['fuel', 'carbon', 'lube', 'overhauls', 'failures', 'capital', 'lostMargin'];

export function fleetByYear(result: CaseResult, details: readonly TruckDetail[], annualHours: Readonly<Record<string, number>>): FleetYear[] {
  const byId = new Map(details.map((d) => [d.truckId, d]));
  const n = Math.max(0, ...result.trucks.map((t) => t.options.rebuild.cashFlows.length - 1));
  const blank = () => ({ capital: 0, cashFlow: 0, fuelLitres: 0, co2Tonnes: 0, tonnes: 0, cost: 0 });
  const rows = Array.from({ length: n + 1 }, (_, year) => ({ year, best: blank(), rebuild: blank(), partYear: false }));
  for (const t of result.trucks) {
    const d = byId.get(t.id);
    if (!d) continue;
    const add = (which: 'best' | 'rebuild', p: PolicyKey) => {
      for (const per of d.policies[p].periods) {
        const r = rows[per.period][which];
        r.capital -= per.breakdown.capital;
        r.cashFlow += per.cashFlow;
        r.fuelLitres += per.fuelLitres;
        r.co2Tonnes += per.co2Tonnes;
        r.tonnes += per.tonnes;
        r.cost -= COSTS.reduce((s, k) => s + per.breakdown[k], 0);
      }
    };
    add('best', t.best);
    add('rebuild', 'rebuild');
    const annual = annualHours[t.id];
    for (const per of d.policies.rebuild.periods) {
      if (per.period > 0 && annual > 0 && per.hours > 0 && per.hours < annual * (1 - 1e-9)) rows[per.period].partYear = true;
    }
  }
  const done = ({ cost, ...f }: ReturnType<typeof blank>): FleetYearFigures => ({ ...f, costPerTonne: f.tonnes > 0 ? cost / f.tonnes : null });
  return rows.map((r) => ({ year: r.year, best: done(r.best), rebuild: done(r.rebuild), partYear: r.partYear }));
}
