import { describe, expect, it } from 'vitest';
import { fleetByYear } from '@/lib/cases/fleet-years';
import type { CaseResult, TruckDetail } from '@/lib/engine/types';

// Hand-built figures (invented); expected values worked by hand from the definition in lib/cases/fleet-years.ts.
const zero = { fuel: 0, carbon: 0, lube: 0, overhauls: 0, failures: 0, capital: 0, lostMargin: 0, extraMargin: 0, taxEffect: 0, residual: 0 };
type P = { period: number; hours: number; fuelLitres: number; co2Tonnes: number; tonnes: number; cashFlow: number; breakdown: Partial<typeof zero> };
const period = (p: P) => ({ ...p, breakdown: { ...zero, ...p.breakdown } });
const policy = (periods: P[]) => ({ periods: periods.map(period) });
const cash = (periods: P[]) => ({ cashFlows: periods.map((p) => p.cashFlow) });

function truck(id: string, best: 'keep' | 'rebuild' | 'repower', rebuild: P[], other: P[]) {
  const detail = { truckId: id, policies: { keep: policy(other), rebuild: policy(rebuild), repower: policy(other) } } as unknown as TruckDetail;
  const result = { id, best, options: { keep: cash(other), rebuild: cash(rebuild), repower: cash(other) } };
  return { detail, result };
}

const A = truck(
  'A',
  'repower',
  [
    { period: 0, hours: 0, fuelLitres: 0, co2Tonnes: 0, tonnes: 0, cashFlow: 0, breakdown: {} },
    { period: 1, hours: 100, fuelLitres: 1200, co2Tonnes: 3.24, tonnes: 200, cashFlow: -150, breakdown: { fuel: -150 } },
    { period: 2, hours: 40, fuelLitres: 480, co2Tonnes: 1.296, tonnes: 80, cashFlow: -60, breakdown: { fuel: -60 } },
  ],
  [
    { period: 0, hours: 0, fuelLitres: 0, co2Tonnes: 0, tonnes: 0, cashFlow: 0, breakdown: {} },
    { period: 1, hours: 100, fuelLitres: 1000, co2Tonnes: 2.7, tonnes: 200, cashFlow: -600, breakdown: { capital: -500, fuel: -100 } },
    { period: 2, hours: 40, fuelLitres: 400, co2Tonnes: 1.08, tonnes: 80, cashFlow: 10, breakdown: { fuel: -40, extraMargin: 50 } },
  ],
);
const B = truck(
  'B',
  'rebuild',
  [
    { period: 0, hours: 0, fuelLitres: 0, co2Tonnes: 0, tonnes: 0, cashFlow: -20, breakdown: { overhauls: -20 } },
    { period: 1, hours: 50, fuelLitres: 500, co2Tonnes: 1.35, tonnes: 100, cashFlow: -70, breakdown: { fuel: -70 } },
  ],
  [],
);
const result = { trucks: [A.result, B.result] } as unknown as CaseResult;

describe('fleetByYear', () => {
  const years = fleetByYear(result, [A.detail, B.detail], { A: 100, B: 50 });

  it('has a row per period up to the longest horizon', () => {
    expect(years.map((y) => y.year)).toEqual([0, 1, 2]);
  });

  it('sums the best mix (A repowered, B rebuilt) and rebuilding everything', () => {
    const y1 = years[1];
    expect(y1.best.capital).toBe(500);
    expect(y1.best.cashFlow).toBe(-600 - 70);
    expect(y1.best.fuelLitres).toBe(1000 + 500);
    expect(y1.best.co2Tonnes).toBeCloseTo(2.7 + 1.35, 9);
    expect(y1.best.costPerTonne).toBeCloseTo((500 + 100 + 70) / 300, 9);
    expect(y1.rebuild.capital).toBe(0);
    expect(y1.rebuild.fuelLitres).toBe(1700);
    expect(y1.rebuild.costPerTonne).toBeCloseTo((150 + 70) / 300, 9);
  });

  it('leaves extra margin out of cost per tonne, and is null without tonnes', () => {
    expect(years[2].best.costPerTonne).toBeCloseTo(40 / 80, 9);
    expect(years[2].best.cashFlow).toBe(10);
    expect(years[0].best.costPerTonne).toBeNull();
    expect(years[0].rebuild.cashFlow).toBe(-20);
  });

  it('marks the part year (A runs 40 of its 100 h in year 2)', () => {
    expect(years.map((y) => y.partYear)).toEqual([false, false, true]);
  });
});
