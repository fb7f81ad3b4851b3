import { describe, expect, it } from 'vitest';
import { roundAdoptedLife, savingPerHour } from '@/lib/engines/overhaul-life';

describe('adopting the recommended overhaul life', () => {
  it('rounds to the nearest 100 h, halves up, within 500–200,000 h (the engine schema limits)', () => {
    expect(roundAdoptedLife(493.2)).toBe(500);
    expect(roundAdoptedLife(18_449.9)).toBe(18_400);
    expect(roundAdoptedLife(18_450)).toBe(18_500);
    expect(roundAdoptedLife(120)).toBe(500);
    expect(roundAdoptedLife(900_000)).toBe(200_000);
    expect(roundAdoptedLife(null)).toBeNull();
  });

  it('saving per hour: C(current) − C(recommended); exponential life, hand formula (common practice)', () => {
    // β = 1: ∫₀ᵀR = η(1 − e^(−T/η)), C(T) = (Cp + (Cf − Cp)(1 − e^(−T/η))) / (η(1 − e^(−T/η))); run to failure: Cf/η
    const input = { weibullShape: 1, weibullScaleHours: 10000, plannedCost: 1, failureCost: 5 };
    const q = 1 - Math.exp(-0.7);
    expect(savingPerHour(input, 7000, null, 5 / 10000)).toBeCloseTo((1 + 4 * q) / (10000 * q) - 5 / 10000, 12);
    expect(savingPerHour(input, 7000, null, 5 / 10000)).toBeGreaterThan(0);
  });
});
