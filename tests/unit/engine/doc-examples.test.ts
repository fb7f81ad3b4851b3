/**
 * Every worked example in the engine's doc comments, run as written.
 * (The published check values have their own files; these are the examples
 * a reader meets beside each function.)
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import * as engine from '@/lib/engine';
import { validateCase } from '@/lib/validation/case';

describe('doc-comment examples', () => {
  it('time value', () => {
    expect(engine.npv(0.08, [-40000, 5000, 8000, 12000, 30000])).toBeCloseTo(3065.22267, 5);
    expect(engine.discountFactor(0.08, 2)).toBeCloseTo(0.857339, 6);
    expect(engine.capitalRecoveryFactor(0.15, 5)).toBeCloseTo(0.298316, 6);
    expect(engine.capitalRecovery(50000, 5000, 5, 0.1)).toBeCloseTo(12370.89, 2);
    expect(engine.equivalentAnnualWorth([-27000, 7000, 7000, 7000, 7000, 17000], 0.15)).toBeCloseTo(428.6, 1);
    expect(engine.equivalentAnnualCost(-1000, 0, 4)).toBe(250);
    expect(engine.pmt(0.075 / 12, 180, 200000)).toBeCloseTo(-1854.0247200054619, 9);
    expect(engine.mirr([-100, 50, -60, 70], 0.1, 0.12)).toBeCloseTo(-0.03909366594356467, 12);
    expect(engine.paybackYears([-1000, 400, 400, 400])).toBe(2.5);
    expect(engine.countSignChanges([-100, 0, 50, -10, 20])).toBe(3);
    expect(engine.irr([-100, 39, 59, 55, 20])).toBeCloseTo(0.28095, 5);
  });

  it('grid, prices, services, residual, best, fleet', () => {
    expect(engine.horizonYears(55000, 6200, null)).toBe(9);
    expect(engine.horizonYears(55000, 6200, 4)).toBe(4);
    expect(engine.priceIndex(0.025, 3)).toBeCloseTo(1.050625, 12);
    expect(engine.priceIndex(0.025, 0)).toBe(1);
    expect(engine.countOilServices(16500, 22500, 250, false)).toBe(24);
    expect(engine.countOilServices(16500, 20000, 250, true)).toBe(13);
    expect(engine.residualCredit(900000, 14500, 20000, 1)).toBeCloseTo(247500, 6);
    const none = { energy: 0, lube: 0, lostMargin: 0, overhauls: 0, failures: 0, capital: 0, extraMargin: 0, depreciation: 0, writeOff: 0 };
    expect(engine.npvFromTotals({ ...none, energy: 100 }, 0.3, true, 1, 0)).toBeCloseTo(-70, 12);
    expect(engine.bestPolicy({ keep: -10, rebuild: -10 + 5e-7, repower: -20 })).toBe('rebuild');
    expect(engine.bestPolicyIndex(-10, -10 + 5e-7, -20)).toBe(1);
    const empty = engine.rollUpFleet([]);
    expect(empty.npv).toEqual({ keep: 0, rebuild: 0, repower: 0, best: 0 });
    expect(empty.capital).toEqual({ keep: 0, rebuild: 0, repower: 0, best: 0 });
  });

  it('depreciation', () => {
    expect(engine.macrsSchedule(100000, 7)[0]).toBeCloseTo(14290, 9);
    expect(engine.straightLineSchedule(1000, 4)).toEqual([250, 250, 250, 250]);
    const db = engine.decliningBalanceSchedule(1000, 5, 2);
    [400, 240, 144, 108, 108].forEach((v, j) => expect(db[j]).toBeCloseTo(v, 9));
    expect(engine.depreciationSchedule(1000, { method: 'straight-line', years: 2 })).toEqual([500, 500]);
    expect(engine.placeSchedule([500, 500], 0, 1)).toEqual({ byPeriod: [0, 500], writeOff: 500 });
  });

  it('reliability and fuel', () => {
    expect(engine.weibullReliability(24000, 3.2, 24000)).toBeCloseTo(0.367879, 6);
    expect(engine.weibullCdf(105, 20, 100)).toBeCloseTo(0.929581, 6);
    expect(engine.conditionalReliability(0, 5000, 3, 20000)).toBe(1);
    expect(engine.medianFailureAge(0, 1, 1000)).toBeCloseTo(693.147, 3);
    expect(engine.medianResidualLife(500, 1, 1000)).toBeCloseTo(1000 * Math.LN2, 9);
    expect(engine.sampleWeibullAge(0.5, 3.2, 24000, 16500)).toBeCloseTo(engine.medianFailureAge(16500, 3.2, 24000), 6);
    expect(engine.cumulativeHazard(24000, 3.2, 24000)).toBeCloseTo(1, 12);
    expect(engine.unitExponential(0.5)).toBeCloseTo(Math.LN2, 15);
    expect(engine.weibullAgeFromExponential(1, 1, 1000)).toBeCloseTo(1000, 9);
    expect(engine.powerDemandKw(0.5, 2000)).toBe(1000);
    expect(engine.modelledBurnLitresPerHour(1000, 210, 0.835)).toBeCloseTo(251.497, 3);
    expect(engine.calibrationFactor(240, 250)).toBeCloseTo(0.96, 12);
    expect(engine.co2Tonnes(1000, 2.697)).toBeCloseTo(2.697, 12);
  });

  it('units', () => {
    expect(engine.kwToHp(0.745699872)).toBeCloseTo(1, 8);
    expect(engine.hpToKw(1)).toBeCloseTo(0.745699872, 9);
    expect(engine.litresToUsGallons(3.785411784)).toBeCloseTo(1, 12);
    expect(engine.usGallonsToLitres(1)).toBeCloseTo(3.785411784, 12);
    expect(engine.gPerKwhToLbPerHpH(225.7)).toBeCloseTo(0.371, 3);
    expect(engine.lbPerHpHToGPerKwh(0.371)).toBeCloseTo(225.67, 2);
    expect(engine.litresPerHourToGallonsPerHour(3.785411784)).toBeCloseTo(1, 12);
    expect(engine.gallonsPerHourToLitresPerHour(1)).toBeCloseTo(3.785411784, 12);
  });

  it('validateCase and evaluateCase', () => {
    const v = validateCase({ format: 'case/1' });
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems).toContainEqual({ path: 'name', message: 'is required' });
    const oneTruck = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));
    expect(engine.evaluateCase(oneTruck).trucks[0].horizonYears).toBe(3);
  });

  it('a horizon over 100 years is refused unless capped', () => {
    const oneTruck = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));
    oneTruck.trucks[0].annualHours = 100;
    const v = validateCase(oneTruck);
    expect(v.ok).toBe(false);
    if (!v.ok) expect(v.problems[0].path).toBe('trucks[0].remainingLifeHours');
    oneTruck.assumptions.horizonYears = 30;
    expect(validateCase(oneTruck).ok).toBe(true);
  });
});
