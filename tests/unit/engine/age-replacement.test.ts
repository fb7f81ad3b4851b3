import { describe, expect, it } from 'vitest';
import { ageReplacementCostRate, ageReplacementCosts, expectedCycleHours, gamma, optimalOverhaulLife } from '@/lib/engine/age-replacement';

describe('age replacement (recommended overhaul life)', () => {
  it('matches the published Weibull example: β = 2.5, η = 1,000 h, preventive 1, corrective 5', () => {
    // ReliaWiki / ReliaSoft "System Analysis Reference", "Optimum Replacement Time Example" (BlockSim examples):
    // optimum replacement age about 493 h, cost per unit time about 0.0035 per hour (both from memory).
    const r = optimalOverhaulLife({ weibullShape: 2.5, weibullScaleHours: 1000, plannedCost: 1, failureCost: 5 });
    expect(r.reason).toBeNull();
    expect(r.optimumHours as number).toBeGreaterThan(490);
    expect(r.optimumHours as number).toBeLessThan(496);
    expect(r.optimumCostPerHour).toBeCloseTo(0.0035, 4);
  });

  it('meets the optimality condition of Barlow & Proschan (1965, ch. 4): h(T)·∫R − F(T) = Cp/(Cf − Cp), C(T*) = (Cf − Cp)·h(T*)', () => {
    const beta = 3.2, eta = 24000, cp = 1.1e6, cf = 2.6e6;
    const r = optimalOverhaulLife({ weibullShape: beta, weibullScaleHours: eta, plannedCost: cp, failureCost: cf });
    const T = r.optimumHours as number;
    const h = (beta / eta) * Math.pow(T / eta, beta - 1);
    const F = 1 - Math.exp(-Math.pow(T / eta, beta));
    expect(h * expectedCycleHours(T, beta, eta) - F).toBeCloseTo(cp / (cf - cp), 6);
    expect(r.optimumCostPerHour / ((cf - cp) * h)).toBeCloseTo(1, 8);
  });

  it('β = 1 (constant hazard): planned overhaul never pays, the optimum is at infinity, said plainly', () => {
    // exponential life: ∫₀ᵀR = η(1 − e^(−T/η)) and the rate falls to Cf/η (common practice)
    const r = optimalOverhaulLife({ weibullShape: 1, weibullScaleHours: 10000, plannedCost: 1, failureCost: 5 });
    expect(r.optimumHours).toBeNull();
    expect(r.reason).toMatch(/never lowers the cost per hour/);
    expect(r.runToFailureCostPerHour).toBeCloseTo(5 / 10000, 12);
    for (let i = 1; i < r.curve.length; i++) expect(r.curve[i].costPerHour).toBeLessThan(r.curve[i - 1].costPerHour);
    const T = 7000;
    expect(ageReplacementCostRate(T, { weibullShape: 1, weibullScaleHours: 10000, plannedCost: 1, failureCost: 5 }))
      .toBeCloseTo((1 + 4 * (1 - Math.exp(-0.7))) / (10000 * (1 - Math.exp(-0.7))), 12);
  });

  it('a failure no dearer than a planned overhaul: never plan', () => {
    expect(optimalOverhaulLife({ weibullShape: 3, weibullScaleHours: 20000, plannedCost: 5, failureCost: 5 }).optimumHours).toBeNull();
  });

  it('integrates R to the mean life (η·Γ(1 + 1/β)) and Γ is right', () => {
    expect(gamma(5)).toBeCloseTo(24, 12);
    expect(gamma(0.5)).toBeCloseTo(Math.sqrt(Math.PI), 12);
    expect(expectedCycleHours(300000, 3.2, 24000) / (24000 * gamma(1 + 1 / 3.2))).toBeCloseTo(1, 9);
    expect(expectedCycleHours(5e6, 0.8, 24000) / (24000 * gamma(1 + 1 / 0.8))).toBeCloseTo(1, 5);
  });

  it('values days down as lost margin at year-1 prices (MODEL.md section 5)', () => {
    const c = ageReplacementCosts(
      { overhaulCost: 900000, overhaulDowntimeDays: 9, failureCost: 1350000, failureDowntimeDays: 28 },
      { annualHours: 6205, tonnesPerHour: 850 }, { marginPerTonne: 2.5, lostMarginShare: 1 },
    );
    expect(c.dayDownCost).toBeCloseTo((6205 / 365) * 850 * 2.5, 9);
    expect(c.plannedCost).toBeCloseTo(900000 + 9 * c.dayDownCost, 6);
    expect(c.failureCost).toBeCloseTo(1350000 + 28 * c.dayDownCost, 6);
  });
});
