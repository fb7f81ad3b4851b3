/**
 * The engine library's Weibull figures against published values, each source
 * named beside its check.
 */
import { describe, expect, it } from 'vitest';
import { failureBeforeLife, reliabilityFigures, weibullMeanLife, weibullMedianLife } from '@/lib/engine/reliability-figures';

describe('Weibull median and mean life', () => {
  it('β = 2: mean η·Γ(1.5) = η·√π/2 (Abramowitz & Stegun 6.1.8 with 6.1.15; Table 6.1: Γ(1.5) = 0.88622 69254 52758)', () => {
    expect(weibullMeanLife(2, 1)).toBeCloseTo(Math.sqrt(Math.PI) / 2, 12);
    expect(weibullMeanLife(2, 1)).toBeCloseTo(0.886226925452758, 12);
    expect(weibullMeanLife(2, 20000)).toBeCloseTo(20000 * 0.886226925452758, 6);
  });

  it('β = 3: mean η·Γ(4/3) (Abramowitz & Stegun Table 6.1: Γ(1.333…) = 0.89297 95115 69249)', () => {
    expect(weibullMeanLife(3, 1)).toBeCloseTo(0.892979511569249, 12);
  });

  it('β = 1 is the exponential law: median η·ln 2, mean η (Abramowitz & Stegun 26.1.30 ff.; any reliability text)', () => {
    expect(weibullMedianLife(1, 1000)).toBeCloseTo(1000 * Math.LN2, 9);
    expect(weibullMedianLife(1, 1000)).toBeCloseTo(693.147180559945, 9);
    expect(weibullMeanLife(1, 1000)).toBeCloseTo(1000, 9);
  });

  it('β = 2 (Rayleigh): median η·√(ln 2)', () => {
    expect(weibullMedianLife(2, 1)).toBeCloseTo(Math.sqrt(Math.LN2), 12);
  });
});

describe('chance of failing before the planned life', () => {
  it('at ℓ = η it is 1 − e^−1 whatever β (the Weibull scale is the 63.2 % life)', () => {
    for (const beta of [0.8, 1, 2, 3.5]) expect(failureBeforeLife(20000, beta, 20000)).toBeCloseTo(1 - Math.exp(-1), 12);
  });

  it('at the median life it is one half', () => {
    expect(failureBeforeLife(weibullMedianLife(2.5, 24000), 2.5, 24000)).toBeCloseTo(0.5, 12);
  });

  it('is 0 for no planned life, and small for a short life: F(x) ≈ (x/η)^β', () => {
    expect(failureBeforeLife(0, 2, 1000)).toBe(0);
    expect(failureBeforeLife(1, 2, 1000)).toBeCloseTo(1e-6, 12);
  });
});

describe('reliabilityFigures', () => {
  it('flags a planned life above the median life', () => {
    const below = reliabilityFigures({ lifeHours: 15000, weibullShape: 3, weibullScaleHours: 25000 });
    expect(below.plannedAboveMedian).toBe(false);
    expect(below.failureBeforePlanned).toBeLessThan(0.5);
    // median of η = 20,000, β = 1 is 13,863 h: a 18,000 h life lies above it
    const above = reliabilityFigures({ lifeHours: 18000, weibullShape: 1, weibullScaleHours: 20000 });
    expect(above.plannedAboveMedian).toBe(true);
    expect(above.medianLifeHours).toBeCloseTo(20000 * Math.LN2, 6);
    expect(above.meanLifeHours).toBeCloseTo(20000, 6);
    expect(above.failureBeforePlanned).toBeCloseTo(1 - Math.exp(-0.9), 12);
    expect(above.failureBeforePlanned).toBeGreaterThan(0.5);
  });
});
