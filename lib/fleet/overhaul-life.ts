/**
 * The recommended overhaul life of an engine type as the engine library shows
 * it (issue 15): which trucks' duty prices a day down, and the age-replacement
 * optimum on that duty (lib/engine/age-replacement.ts has the model). Pure.
 *
 * ## Duty
 *
 * A day down costs (annualHours / 365) · tonnesPerHour · marginPerTonne ·
 * lostMarginShare (MODEL.md section 5). The hours and tonnes per hour are the
 * plain means over the trucks fitted with the engine type today; an engine
 * type no truck has yet (a repower engine) takes the trucks whose own repower
 * offer fits it, since those would run it; with neither, days down are not
 * priced and only the overhaul and repair costs count.
 *
 * ## What the rate is
 *
 * A steady-state, undiscounted cost per operating hour at year-1 prices, no
 * tax: the long-run cost of the rebuild cycle, not a horizon npv. A case that
 * adopts the life gets the npv of its rebuild with it.
 *
 * ## Worked example (tests/unit/fleet/overhaul-life.test.ts)
 *
 * Two trucks fitted, 6,000 h and 5,000 h a year, 800 and 600 t/h: the mean
 * duty is 5,500 h a year and 700 t/h; at 2.5 a tonne and a lost-margin share
 * of 1 a day down costs 5,500 / 365 · 700 · 2.5 = 26,369.86.
 */
import { ageReplacementCostRate, ageReplacementCosts, optimalOverhaulLife } from '@/lib/engine/age-replacement';
import { LIMITS } from '@/lib/validation/case';

export type DutyTruck = { unitNumber: string; engineTypeId: number; repowerOfferId: number | null; annualHours: number; tonnesPerHour: number };
export type DutyOffer = { id: number; engineTypeId: number };

export interface EngineDuty {
  /** whose duty: the trucks fitted with it, those whose offer would fit it, or none */
  basis: 'fitted' | 'offered' | 'none';
  /** unit numbers, as the register sorts them */
  trucks: string[];
  /** mean annual hours over those trucks (0 when none) */
  annualHours: number;
  /** mean tonnes an hour over those trucks (0 when none) */
  tonnesPerHour: number;
}

const mean = (xs: number[]) => (xs.length ? xs.reduce((s, x) => s + x, 0) / xs.length : 0);

/** The duty that prices a day down of this engine type (see the module comment). */
export function dutyOfEngine(engineTypeId: number, trucks: DutyTruck[], offers: DutyOffer[]): EngineDuty {
  const offerEngine = new Map(offers.map((o) => [o.id, o.engineTypeId]));
  const fitted = trucks.filter((t) => t.engineTypeId === engineTypeId);
  const offered = trucks.filter((t) => t.repowerOfferId !== null && offerEngine.get(t.repowerOfferId) === engineTypeId);
  const chosen = fitted.length ? fitted : offered;
  const basis = fitted.length ? 'fitted' : offered.length ? 'offered' : 'none';
  const sorted = [...chosen].sort((a, b) => a.unitNumber.localeCompare(b.unitNumber, 'en', { numeric: true }));
  return {
    basis,
    trucks: sorted.map((t) => t.unitNumber),
    annualHours: mean(chosen.map((t) => t.annualHours)),
    tonnesPerHour: mean(chosen.map((t) => t.tonnesPerHour)),
  };
}

export type LifeEngine = {
  lifeHours: number; weibullShape: number; weibullScaleHours: number;
  overhaulCost: number; overhaulDowntimeDays: number; failureCost: number; failureDowntimeDays: number;
};

export interface OverhaulLifeRecommendation {
  /** the planned life with the lowest cost per hour; null: at infinity (run to failure) */
  optimumHours: number | null;
  /** the optimum as a case can adopt it: whole hours within the case file's lifeHours range; null when there is no finite optimum */
  adoptableHours: number | null;
  /** why no finite optimum, in plain words; null when there is one */
  reason: string | null;
  /** money per operating hour */
  optimumCostPerHour: number;
  currentCostPerHour: number;
  runToFailureCostPerHour: number;
  /** the library's planned life */
  currentHours: number;
  plannedCost: number;
  failureCost: number;
  dayDownCost: number;
  /** the cost-rate curve, hours ascending */
  curve: { hours: number; costPerHour: number }[];
  /** a few points for the table beside the chart, hours ascending (current and optimum among them) */
  points: { hours: number; costPerHour: number; mark: 'current' | 'optimum' | null }[];
}

/** The age-replacement optimum of an engine type on a duty and a margin (see the module comment). */
export function recommendOverhaulLife(
  engine: LifeEngine,
  duty: Pick<EngineDuty, 'annualHours' | 'tonnesPerHour'>,
  assumptions: { marginPerTonne: number; lostMarginShare?: number },
): OverhaulLifeRecommendation {
  const costs = ageReplacementCosts(engine, duty, assumptions);
  const law = { weibullShape: engine.weibullShape, weibullScaleHours: engine.weibullScaleHours, plannedCost: costs.plannedCost, failureCost: costs.failureCost };
  // the curve reaches past both marks, and at least twice the scale
  const first = optimalOverhaulLife(law);
  const to = Math.max(2 * engine.weibullScaleHours, 1.3 * engine.lifeHours, 1.3 * (first.optimumHours ?? 0));
  const result = optimalOverhaulLife({ ...law, curveToHours: to, curvePoints: 160 });
  const rate = (T: number) => ageReplacementCostRate(T, law);
  const optimum = result.optimumHours;
  const adoptable = optimum === null ? null : Math.min(LIMITS.lifeHours.max, Math.max(LIMITS.lifeHours.min, Math.round(optimum)));
  const centre = optimum ?? engine.lifeHours;
  const marks = new Map<number, 'current' | 'optimum' | null>();
  for (const f of [0.5, 0.75, 1.25, 1.5, 2]) marks.set(Math.round((centre * f) / 100) * 100, null);
  marks.set(engine.lifeHours, 'current');
  if (optimum !== null) marks.set(optimum, 'optimum');
  const points = [...marks.entries()]
    .filter(([h]) => h > 0)
    .sort((a, b) => a[0] - b[0])
    .map(([hours, mark]) => ({ hours, costPerHour: rate(hours), mark }));
  return {
    optimumHours: optimum,
    adoptableHours: adoptable,
    reason: result.reason,
    optimumCostPerHour: result.optimumCostPerHour,
    currentCostPerHour: rate(engine.lifeHours),
    runToFailureCostPerHour: result.runToFailureCostPerHour,
    currentHours: engine.lifeHours,
    plannedCost: costs.plannedCost,
    failureCost: costs.failureCost,
    dayDownCost: costs.dayDownCost,
    curve: result.curve,
    points,
  };
}

/** The assumption set a recommendation reads by default: the one named Base, else the first. */
export function defaultAssumptionSet<T extends { name: string }>(sets: T[]): T | undefined {
  return sets.find((s) => s.name.trim().toLowerCase() === 'base') ?? sets[0];
}
