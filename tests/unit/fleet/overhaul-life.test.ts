import { describe, expect, it } from 'vitest';
import { defaultAssumptionSet, dutyOfEngine, recommendOverhaulLife, type DutyTruck } from '@/lib/fleet/overhaul-life';

const truck = (unitNumber: string, engineTypeId: number, annualHours: number, tonnesPerHour: number, repowerOfferId: number | null = null): DutyTruck => ({
  unitNumber, engineTypeId, annualHours, tonnesPerHour, repowerOfferId,
});

/** ∫₀ᵀ exp(−(t/η)^β) dt by the trapezoid rule on 200,000 steps: a plain check of the engine's quadrature. */
const cycleHours = (T: number, beta: number, eta: number) => {
  const n = 200_000;
  let s = 0;
  for (let i = 0; i <= n; i++) s += (i === 0 || i === n ? 0.5 : 1) * Math.exp(-Math.pow(((T * i) / n) / eta, beta));
  return (s * T) / n;
};
const rateByHand = (T: number, beta: number, eta: number, cp: number, cf: number) => {
  const R = Math.exp(-Math.pow(T / eta, beta));
  return (cp * R + cf * (1 - R)) / cycleHours(T, beta, eta);
};

describe('dutyOfEngine', () => {
  const trucks = [truck('T10', 1, 5000, 600, 7), truck('T2', 1, 6000, 800), truck('T3', 2, 4000, 500, 7), truck('T4', 2, 4400, 300, 7)];
  const offers = [{ id: 7, engineTypeId: 3 }];

  it('is the plain mean of the trucks fitted with the engine type (the module comment’s worked example), named in register order', () => {
    const d = dutyOfEngine(1, trucks, offers);
    expect(d).toEqual({ basis: 'fitted', trucks: ['T2', 'T10'], annualHours: 5500, tonnesPerHour: 700 });
    // a day down on that duty at 2.5 a tonne: 5,500 / 365 · 700 · 2.5
    const r = recommendOverhaulLife({ lifeHours: 20000, weibullShape: 3, weibullScaleHours: 30000, overhaulCost: 1e6, overhaulDowntimeDays: 10, failureCost: 2e6, failureDowntimeDays: 30 }, d, { marginPerTonne: 2.5 });
    expect(r.dayDownCost).toBeCloseTo(26369.863, 2);
    expect(r.plannedCost).toBeCloseTo(1e6 + 10 * 26369.863, 1);
    expect(r.failureCost).toBeCloseTo(2e6 + 30 * 26369.863, 1);
  });

  it('takes the trucks whose repower offer fits an engine type no truck has yet', () => {
    expect(dutyOfEngine(3, trucks, offers)).toEqual({ basis: 'offered', trucks: ['T3', 'T4', 'T10'], annualHours: 4466.666666666667, tonnesPerHour: 466.6666666666667 });
  });

  it('has no duty for an engine type no truck has or would get: days down are not priced', () => {
    const d = dutyOfEngine(9, trucks, offers);
    expect(d).toEqual({ basis: 'none', trucks: [], annualHours: 0, tonnesPerHour: 0 });
    const r = recommendOverhaulLife({ lifeHours: 20000, weibullShape: 3, weibullScaleHours: 30000, overhaulCost: 1e6, overhaulDowntimeDays: 10, failureCost: 2e6, failureDowntimeDays: 30 }, d, { marginPerTonne: 2.5 });
    expect(r.dayDownCost).toBe(0);
    expect([r.plannedCost, r.failureCost]).toEqual([1e6, 2e6]);
  });
});

describe('recommendOverhaulLife', () => {
  const engine = { lifeHours: 20000, weibullShape: 3, weibullScaleHours: 33000, overhaulCost: 900_000, overhaulDowntimeDays: 9, failureCost: 1_350_000, failureDowntimeDays: 28 };
  const duty = { annualHours: 6000, tonnesPerHour: 800 };
  const margin = { marginPerTonne: 2.5, lostMarginShare: 0.5 };
  const day = (6000 / 365) * 800 * 2.5 * 0.5;
  const cp = 900_000 + 9 * day;
  const cf = 1_350_000 + 28 * day;

  it('finds the life where the rate meets the optimality condition C(T*) = (Cf − Cp)·h(T*) (Barlow & Proschan 1965, ch. 4), lower than at the current life and than running to failure', () => {
    const r = recommendOverhaulLife(engine, duty, margin);
    const T = r.optimumHours!;
    const hazard = (3 / 33000) * Math.pow(T / 33000, 2);
    expect(r.optimumCostPerHour / ((cf - cp) * hazard)).toBeCloseTo(1, 5);
    expect(r.optimumCostPerHour / rateByHand(T, 3, 33000, cp, cf)).toBeCloseTo(1, 6);
    expect(r.currentCostPerHour / rateByHand(20000, 3, 33000, cp, cf)).toBeCloseTo(1, 6);
    // E[X] = η·Γ(1 + 1/3) = 33,000 × 0.8929795
    expect(r.runToFailureCostPerHour).toBeCloseTo(cf / (33000 * 0.8929795116), 3);
    expect(r.optimumCostPerHour).toBeLessThan(r.currentCostPerHour);
    expect(r.optimumCostPerHour).toBeLessThan(r.runToFailureCostPerHour);
    expect(r.adoptableHours).toBe(Math.round(T));
    expect(r.reason).toBeNull();
  });

  it('draws the curve past both marks and lists a few points with the current life and the optimum marked', () => {
    const r = recommendOverhaulLife(engine, duty, margin);
    const last = r.curve[r.curve.length - 1].hours;
    expect(last).toBeGreaterThan(Math.max(r.optimumHours!, engine.lifeHours));
    expect(r.curve.every((p, i) => i === 0 || p.hours > r.curve[i - 1].hours)).toBe(true);
    expect(r.points.filter((p) => p.mark === 'current')).toEqual([{ hours: 20000, costPerHour: r.currentCostPerHour, mark: 'current' }]);
    expect(r.points.filter((p) => p.mark === 'optimum').map((p) => p.hours)).toEqual([r.optimumHours]);
    expect(r.points.length).toBeGreaterThanOrEqual(5);
    expect(r.points.every((p, i) => i === 0 || p.hours > r.points[i - 1].hours)).toBe(true);
    expect(Math.min(...r.points.map((p) => p.costPerHour))).toBe(r.optimumCostPerHour);
  });

  it('says plainly that a planned overhaul never pays for a constant hazard (β = 1), with nothing to adopt', () => {
    const r = recommendOverhaulLife({ ...engine, weibullShape: 1 }, duty, margin);
    expect(r.optimumHours).toBeNull();
    expect(r.adoptableHours).toBeNull();
    expect(r.reason).toMatch(/never lowers the cost per hour/);
    // E[X] = η for β = 1
    expect(r.runToFailureCostPerHour).toBeCloseTo(cf / 33000, 6);
    expect(r.points.filter((p) => p.mark === 'optimum')).toEqual([]);
  });

  it('keeps an adoptable life within the case file’s lifeHours range', () => {
    // a scale at the floor with a steep wear-out puts the optimum near 500 h or below
    const r = recommendOverhaulLife({ ...engine, lifeHours: 500, weibullScaleHours: 500, weibullShape: 6, overhaulCost: 1, failureCost: 1e6 }, { annualHours: 0, tonnesPerHour: 0 }, margin);
    expect(r.optimumHours!).toBeLessThan(500);
    expect(r.adoptableHours).toBe(500);
  });
});

describe('defaultAssumptionSet', () => {
  it('is the set named Base, else the first', () => {
    expect(defaultAssumptionSet([{ name: 'High fuel' }, { name: 'Base' }])).toEqual({ name: 'Base' });
    expect(defaultAssumptionSet([{ name: 'High fuel' }, { name: 'Low fuel' }])).toEqual({ name: 'High fuel' });
    expect(defaultAssumptionSet([])).toBeUndefined();
  });
});
