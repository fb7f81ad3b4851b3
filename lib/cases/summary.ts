/** Fleet figures and timelines drawn from the engine's result; pure. */
import type { CaseResult, PolicyDetail, PolicyKey, TruckDetail } from '@/lib/engine/types';
import { POLICIES } from '@/lib/engine/types';
import { monthOfEvent } from '@/lib/plan';
import type { FleetSummary, TimelineEvent } from './types';

export function summariseFleet(result: CaseResult): FleetSummary {
  const trucksByBest: Record<PolicyKey, number> = { keep: 0, rebuild: 0, repower: 0 };
  const capital = new Map<number, number>();
  let fuel = 0;
  let co2 = 0;
  for (const t of result.trucks) {
    trucksByBest[t.best]++;
    t.options[t.best].breakdown.forEach((b, y) => {
      if (Math.abs(b.capital) > 1e-6) capital.set(y, (capital.get(y) ?? 0) - b.capital);
    });
    // a yearly figure per truck, since horizons differ from truck to truck
    const years = Math.max(1, t.horizonYears);
    fuel += (t.options.rebuild.fuelLitres - t.options[t.best].fuelLitres) / years;
    co2 += (t.options.rebuild.co2Tonnes - t.options[t.best].co2Tonnes) / years;
  }
  return {
    trucksByBest,
    capitalByYear: [...capital].sort((a, b) => a[0] - b[0]).map(([year, amount]) => ({ year, amount })),
    fuelSavedLitresPerYear: fuel,
    co2SavedTonnesPerYear: co2,
  };
}

function timeline(p: PolicyDetail, annualHours: number): TimelineEvent[] {
  return p.events.map((e) => ({
    kind: e.kind,
    period: e.period,
    month: monthOfEvent(e.period, e.hourOfYear, annualHours),
    engineAge: e.engineAge,
    cost: e.cost,
    downtimeDays: e.downtimeDays,
  }));
}

export function timelines(detail: TruckDetail, annualHours: number): Record<PolicyKey, TimelineEvent[]> {
  return Object.fromEntries(POLICIES.map((p) => [p, timeline(detail.policies[p], annualHours)])) as Record<PolicyKey, TimelineEvent[]>;
}
