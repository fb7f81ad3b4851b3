/**
 * Weibull, fuel/CO2 and unit conversions against published values
 * (shared/CHECKS.md), each source named beside its check.
 */
import { describe, expect, it } from 'vitest';
import {
  co2Tonnes,
  calibrationFactor,
  conditionalReliability,
  cumulativeHazard,
  gPerKwhToLbPerHpH,
  gallonsPerHourToLitresPerHour,
  hpToKw,
  kwToHp,
  lbPerHpHToGPerKwh,
  litresPerHourToGallonsPerHour,
  litresToUsGallons,
  medianFailureAge,
  medianResidualLife,
  modelledBurnLitresPerHour,
  powerDemandKw,
  sampleWeibullAge,
  unitExponential,
  usGallonsToLitres,
  weibullAgeFromExponential,
  weibullCdf,
  weibullReliability,
} from '@/lib/engine';

describe('Weibull reliability', () => {
  it('CDF matches the spreadsheet WEIBULL.DIST example', () => {
    // Microsoft Excel WEIBULL.DIST help: WEIBULL.DIST(105, 20, 100, TRUE) = 0.929581
    expect(weibullCdf(105, 20, 100)).toBeCloseTo(0.929581, 6);
  });

  it('R(t) = exp(−(t/η)^β)', () => {
    // MIL-HDBK-338B; Nelson, Applied Life Data Analysis (1982): at t = η, R = e^−1 whatever β
    expect(weibullReliability(24000, 3.2, 24000)).toBeCloseTo(Math.exp(-1), 12);
    expect(weibullReliability(0, 3.2, 24000)).toBe(1);
  });

  it('conditional survival is R(T+t)/R(T)', () => {
    // MIL-HDBK-338B; Nelson (1982): P(survive t more | survived T) = R(T+t)/R(T)
    const T = 16500;
    const t = 3000;
    const expected = Math.exp(-((19500 / 24000) ** 3.2)) / Math.exp(-((16500 / 24000) ** 3.2));
    expect(conditionalReliability(t, T, 3.2, 24000)).toBeCloseTo(expected, 12);
    // β = 1 has no memory: conditional survival equals unconditional
    expect(conditionalReliability(500, 7000, 1, 1000)).toBeCloseTo(weibullReliability(500, 1, 1000), 12);
  });

  it('median failure age given survival has conditional survival 1/2', () => {
    const age = medianFailureAge(16500, 3.2, 24000);
    expect(conditionalReliability(age - 16500, 16500, 3.2, 24000)).toBeCloseTo(0.5, 12);
    // a new engine: η·(ln 2)^(1/β); β = 1 gives η·ln 2
    expect(medianFailureAge(0, 1, 1000)).toBeCloseTo(1000 * Math.LN2, 9);
    expect(medianResidualLife(500, 1, 1000)).toBeCloseTo(1000 * Math.LN2, 9);
  });

  it('the sampler inverts the conditional CDF and gives the median at u = 0.5', () => {
    expect(sampleWeibullAge(0.5, 3.2, 24000, 16500)).toBeCloseTo(medianFailureAge(16500, 3.2, 24000), 6);
    const t = sampleWeibullAge(0.9, 3.2, 24000, 5000);
    expect(1 - conditionalReliability(t - 5000, 5000, 3.2, 24000)).toBeCloseTo(0.9, 12);
    // extremes stay finite and beyond the current age
    expect(sampleWeibullAge(0, 3.2, 24000, 5000)).toBeGreaterThan(5000);
    expect(Number.isFinite(sampleWeibullAge(1, 3.2, 24000, 5000))).toBe(true);
  });

  it('a draw split into its unit exponential and the law is the same number (what Monte Carlo caches)', () => {
    for (let k = 0; k < 2000; k++) {
      const u = (k + 0.5) / 2000;
      for (const [shape, scale, age] of [[3.2, 24000, 0], [3.2, 24000, 16500], [1.4, 31000, 9000], [8, 20000, 25000]]) {
        const split = weibullAgeFromExponential(unitExponential(u), shape, scale, age, cumulativeHazard(age, shape, scale));
        expect(split).toBe(sampleWeibullAge(u, shape, scale, age));
      }
    }
    // a new engine's cumulative hazard is exactly 0; e = H(L) is the planned life L itself (within rounding)
    expect(cumulativeHazard(0, 3.2, 24000)).toBe(0);
    const l = 20000;
    expect(weibullAgeFromExponential(cumulativeHazard(l, 3.2, 24000), 3.2, 24000)).toBeCloseTo(l, 6);
  });
});

describe('fuel and CO2', () => {
  it('CO2 per litre of diesel: 10.21 kg per US gallon = 2.697 kg per litre', () => {
    // US EPA GHG Emission Factors Hub (mobile combustion, diesel): 10.21 kg CO2 per gallon
    expect(10.21 / 3.785411784).toBeCloseTo(2.697, 3);
    // 40 CFR 98 Table C-1: 73.96 kg CO2/mmBtu × 0.138 mmBtu/gal = 10.206 kg/gal
    expect((73.96 * 0.138) / 3.785411784).toBeCloseTo(2.697, 2);
    expect(co2Tonnes(1000, 2.697)).toBeCloseTo(2.697, 12);
  });

  it('the IPCC factor with an EN 590 density lands within 4 % of the EPA factor', () => {
    // IPCC 2006 Guidelines Vol. 2, Tables 1.4 and 1.2: 74,100 kg CO2/TJ, 43.0 TJ/Gg; EN 590: 820–845 kg/m³
    const kgCo2PerKgFuel = (74100 * 43.0) / 1e6;
    for (const density of [0.82, 0.845]) expect(Math.abs(kgCo2PerKgFuel * density - 2.697) / 2.697).toBeLessThan(0.04);
  });

  it('modelled burn is P·BSFC/(1000·density), calibrated by a measurement', () => {
    // 0.5 × 2000 kW = 1000 kW; 1000 × 210 / (1000 × 0.835) = 251.497 L/h
    const p = powerDemandKw(0.5, 2000);
    expect(p).toBe(1000);
    expect(modelledBurnLitresPerHour(p, 210, 0.835)).toBeCloseTo(251.497006, 5);
    expect(calibrationFactor(240, 250)).toBeCloseTo(0.96, 12);
    expect(calibrationFactor(null, 250)).toBe(1);
  });
});

describe('unit conversions (mathjs)', () => {
  it('1 hp = 745.699872 W', () => {
    // NIST SP 811, Appendix B.8: horsepower (550 ft·lbf/s) = 745.699 872 W
    expect(hpToKw(1) * 1000).toBeCloseTo(745.699872, 6);
    expect(kwToHp(0.745699872)).toBeCloseTo(1, 8);
  });

  it('1 US gallon = 3.785411784 L', () => {
    // NIST SP 811 (231 in³ exactly)
    expect(usGallonsToLitres(1)).toBeCloseTo(3.785411784, 12);
    expect(litresToUsGallons(3.785411784)).toBeCloseTo(1, 12);
    expect(gallonsPerHourToLitresPerHour(1)).toBeCloseTo(3.785411784, 12);
    expect(litresPerHourToGallonsPerHour(3.785411784)).toBeCloseTo(1, 12);
  });

  it('BSFC 0.371 lb/hp-hr ≈ 225.7 g/kWh', () => {
    // US EPA NONROAD2008a BSFC.EMF (units from report NR-009d, from memory); 1 lb = 0.45359237 kg (NIST SP 811)
    expect(lbPerHpHToGPerKwh(0.371)).toBeCloseTo(225.7, 1);
    expect(gPerKwhToLbPerHpH(225.67)).toBeCloseTo(0.371, 4);
    // exact chain: 453.59237 g / 0.745699872 kWh per lb/hp-h
    expect(lbPerHpHToGPerKwh(1)).toBeCloseTo(453.59237 / 0.74569987158227, 6);
  });
});
