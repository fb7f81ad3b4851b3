import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCaseDetailed, validateCase, type CaseFile } from '@/lib/engine';
import type { CaseResult, PolicyKey, TruckDetail } from '@/lib/engine/types';
import { forFiscalYear, monthOfIndex, planVsActual, type ActualReading } from '@/lib/readings/plan-vs-actual';

const START = '2027-01';

function demoCase(): CaseFile {
  const raw = JSON.parse(fs.readFileSync(path.join(__dirname, '../../../scenarios/aldervane-north-pit.json'), 'utf8'));
  // a carbon price, so the price of a litre includes its carbon (the demo has none)
  raw.assumptions.carbonPrice = 40;
  raw.assumptions.carbonEscalation = 0.02;
  raw.trucks = raw.trucks.slice(0, 6);
  const v = validateCase(raw);
  if (!v.ok) throw new Error(JSON.stringify(v.problems));
  return v.value;
}

const POLICIES: Record<string, PolicyKey> = { 'T3-01': 'repower', 'T3-02': 'repower', 'T3-03': 'repower', 'T3-04': 'rebuild', 'T3-05': 'keep', 'T3-06': 'rebuild' };

/**
 * Readings that are exactly the engine's own forecast: each month of year y
 * runs the engine's period hours / 12 and burns its period litres / 12 (from
 * the detailed trace, not from the result the module reads), with the
 * expected events, days down and planned capital.
 */
function forecastReadings(file: CaseFile, result: CaseResult, details: TruckDetail[], months: number, fuelFactor: Record<string, number> = {}): ActualReading[] {
  const out: ActualReading[] = [];
  for (const d of details) {
    const policy = POLICIES[d.truckId];
    const t = file.trucks.find((x) => x.id === d.truckId)!;
    const pol = d.policies[policy];
    const res = result.trucks.find((x) => x.id === d.truckId)!.options[policy];
    let meter = t.engineHours;
    out.push({ unit: d.truckId, month: monthOfIndex(START, -1), hourMeter: meter, fuelLitres: 0, overhauls: 0, failures: 0, daysDown: 0, repowerDate: null, repowerCost: null });
    for (let m = 0; m < months; m++) {
      const y = Math.floor(m / 12) + 1;
      const p = pol.periods[y];
      const h = p.hours / 12;
      // planned capital of year y in its first month (no swap months given), period 0's in month 0
      const capital = (m % 12 === 0 ? -res.breakdown[y].capital : 0) + (m === 0 ? -res.breakdown[0].capital : 0);
      const repowered = capital > 0;
      meter = repowered ? h : meter + h;
      const ev = res.events[y];
      const ev0 = m === 0 ? res.events[0] : { overhauls: 0, repairs: 0, repowers: 0 };
      out.push({
        unit: d.truckId, month: monthOfIndex(START, m), hourMeter: meter, fuelLitres: (p.fuelLitres / 12) * (fuelFactor[d.truckId] ?? 1),
        overhauls: ev.overhauls / 12 + ev0.overhauls, failures: ev.repairs / 12 + ev0.repairs, daysDown: 0,
        repowerDate: repowered ? `${monthOfIndex(START, m)}-15` : null, repowerCost: repowered ? capital : null,
      });
    }
  }
  return out;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(1, Math.abs(b));

describe('plan against actual', () => {
  const file = demoCase();
  const { result, details } = evaluateCaseDetailed(file);

  it('readings equal to the engine\'s own expected figures give every variance zero', () => {
    const readings = forecastReadings(file, result, details, 24);
    const pva = planVsActual({ file, result, policies: POLICIES, startMonth: START, readings, tolerance: 0.05 });
    expect(pva.trucks).toHaveLength(6);
    expect(pva.fleetMonths).toHaveLength(24);
    let capitalSeen = 0;
    for (const t of pva.trucks) {
      expect(t.months).toHaveLength(24);
      for (const m of t.months) {
        expect(rel(m.hours, m.forecastHours)).toBeLessThan(1e-9);
        expect(rel(m.litres, m.expectedLitres)).toBeLessThan(1e-9);
        expect(rel(m.fuelCost, m.expectedFuelCost)).toBeLessThan(1e-9);
        expect(rel(m.capital, m.plannedCapital)).toBeLessThan(1e-9);
        expect(rel(m.overhauls, m.expectedOverhauls)).toBeLessThan(1e-9);
        expect(rel(m.failures, m.expectedFailures)).toBeLessThan(1e-9);
        expect(Math.abs(m.saving - m.forecastSaving) / (Math.abs(m.forecastSaving) + 1)).toBeLessThan(1e-9);
        capitalSeen += m.capital;
      }
      expect(Math.abs(t.hoursVariance!)).toBeLessThan(1e-9);
      expect(Math.abs(t.burnVariance!)).toBeLessThan(1e-9);
      expect(t.flags).toEqual([]);
    }
    // the case does plan repower capital within the two years, so the capital check is not empty
    expect(capitalSeen).toBeGreaterThan(0);
    expect(Math.abs(pva.fleet.saving - pva.fleet.forecastSaving) / (Math.abs(pva.fleet.forecastSaving) + 1)).toBeLessThan(1e-9);
  });

  it('a truck burning 5 % more shows exactly 5 % more, is flagged at a 4 % tolerance, and its saving falls by the engine\'s price of that fuel', () => {
    const base = planVsActual({ file, result, policies: POLICIES, startMonth: START, readings: forecastReadings(file, result, details, 24), tolerance: 0.04 });
    const more = planVsActual({ file, result, policies: POLICIES, startMonth: START, readings: forecastReadings(file, result, details, 24, { 'T3-04': 1.05 }), tolerance: 0.04 });
    const t = more.trucks.find((x) => x.unit === 'T3-04')!;
    expect(t.burnVariance!).toBeCloseTo(0.05, 12);
    expect(t.flags).toEqual(['burn']);
    expect(more.trucks.filter((x) => x.flags.length).map((x) => x.unit)).toEqual(['T3-04']);
    // the engine's own price of a litre in year y: its fuel + carbon cost of the period over its litres
    const d = details.find((x) => x.truckId === 'T3-04')!.policies.rebuild;
    let extraCost = 0;
    for (let m = 0; m < 24; m++) {
      const p = d.periods[Math.floor(m / 12) + 1];
      const price = (-p.breakdown.fuel - p.breakdown.carbon) / p.fuelLitres;
      extraCost += 0.05 * (p.fuelLitres / 12) * price;
    }
    const before = base.trucks.find((x) => x.unit === 'T3-04')!.total.saving;
    expect(Math.abs(before - t.total.saving - extraCost) / extraCost).toBeLessThan(1e-9);
    // 5 % at a 5 % tolerance is not beyond it
    const at5 = planVsActual({ file, result, policies: POLICIES, startMonth: START, readings: forecastReadings(file, result, details, 24, { 'T3-04': 1.05 }), tolerance: 0.05 });
    expect(at5.trucks.find((x) => x.unit === 'T3-04')!.flags).toEqual([]);
  });

  it('the worked example of the module comment', () => {
    // one truck, year 1: fuel 1.00 /L, no carbon, rebuild 200 L/h + 100 /h other costs, repower 180 L/h + 90 /h, 6,000 h a year
    const mini = {
      assumptions: { fuelPrice: 1, fuelEscalation: 0, carbonPrice: 0, carbonEscalation: 0, co2KgPerLitre: 2.7 },
      engines: [{ id: 'e', overhaulDowntimeDays: 8, failureDowntimeDays: 20 }, { id: 'n', overhaulDowntimeDays: 6, failureDowntimeDays: 18 }],
      repowerOffers: [{ id: 'o', engineId: 'n', downtimeDays: 3 }],
      trucks: [{ id: 'X', engineId: 'e', repowerOfferId: 'o', engineHours: 1000, annualHours: 6000, remainingLifeHours: 12000 }],
    } as unknown as CaseFile;
    const zero = { fuel: 0, carbon: 0, lube: 0, overhauls: 0, failures: 0, capital: 0, lostMargin: 0, extraMargin: 0, taxEffect: 0, residual: 0 };
    // year 1 costs: litres · 1.00 in fuel, the rest in lube (the other costs per hour)
    const option = (burn: number, other: number) => ({
      breakdown: [zero, { ...zero, fuel: -burn * 6000, lube: -other * 6000 }, zero],
      events: [{ overhauls: 0, repairs: 0, repowers: 0 }, { overhauls: 0, repairs: 0, repowers: 0 }, { overhauls: 0, repairs: 0, repowers: 0 }],
      fuelLitresPerHour: burn,
    });
    const res = { trucks: [{ id: 'X', horizonYears: 2, options: { keep: option(200, 100), rebuild: option(200, 100), repower: option(180, 90) } }] } as unknown as CaseResult;
    const readings: ActualReading[] = [
      { unit: 'X', month: '2026-12', hourMeter: 1000, fuelLitres: 0, overhauls: 0, failures: 0, daysDown: 0, repowerDate: null, repowerCost: null },
      { unit: 'X', month: '2027-01', hourMeter: 1480, fuelLitres: 90_000, overhauls: 0, failures: 0, daysDown: 0, repowerDate: null, repowerCost: null },
    ];
    const pva = planVsActual({ file: mini, result: res, policies: { X: 'repower' }, startMonth: START, readings, tolerance: 0.05 });
    const m = pva.trucks[0].months[0];
    expect(m.hours).toBe(480);
    expect(m.forecastHours).toBe(500);
    expect(m.expectedLitres).toBeCloseTo(86_400, 9);
    expect(m.forecastSaving).toBeCloseTo(15_000, 9);
    expect(m.saving).toBeCloseTo(10_800, 9);
    expect(pva.trucks[0].burnVariance!).toBeCloseTo(90_000 / 86_400 - 1, 12);
    // 4.17 % more fuel and 4 % fewer hours: within ± 5 %
    expect(pva.trucks[0].flags).toEqual([]);
    // the baseline month (2026-12) is not compared
    expect(pva.trucks[0].months).toHaveLength(1);
  });

  it('fiscal year to date: the months of one fiscal year only', () => {
    const pva = planVsActual({ file, result, policies: POLICIES, startMonth: START, readings: forecastReadings(file, result, details, 18), tolerance: 0.05, fiscalYearStartMonth: 7 });
    // 2027-01 … 2028-06: FY2027 (Jan–Jun 2027), FY2028 (Jul 2027–Jun 2028)
    expect(pva.fiscalYears).toEqual([2027, 2028]);
    const fy = forFiscalYear(pva, 2028);
    expect(fy.fleetMonths.map((m) => m.month)[0]).toBe('2027-07');
    expect(fy.trucks[0].months).toHaveLength(12);
    expect(fy.fleet.hours + forFiscalYear(pva, 2027).fleet.hours).toBeCloseTo(pva.fleet.hours, 6);
  });
});
