/**
 * Issue 12: every number of a case at the ends of its range, combined at
 * random, evaluates to finite numbers in a bounded number of steps (events
 * per run under the engine's cap, one segment per event or year's end), on
 * the full path (`evaluateCaseDetailed`) and the NPV-only path (`evaluateNpvs`).
 * No timing: the bound is on counted work.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { evaluateCaseDetailed, evaluateNpvs, MAX_EVENTS_PER_RUN, POLICIES } from '@/lib/engine';
import { validateCase, type CaseFileInput } from '@/lib/validation/case';

const base: CaseFileInput = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));

/** [lowest accepted, highest accepted] of each field (an open end: the nearest value inside). */
const ENGINE: Record<string, [number, number]> = {
  ratedKw: [1, 10_000], bsfcGPerKwh: [50, 1000], lifeHours: [500, 200_000], weibullShape: [0.5, 20],
  weibullScaleHours: [500, 1_000_000], overhaulCost: [0, 1e10], overhaulDowntimeDays: [0, 365], failureCost: [0, 1e10],
  failureDowntimeDays: [0, 365], serviceIntervalHours: [10, 100_000], sumpLitres: [0, 10_000], serviceKitCost: [0, 1e10],
  serviceLabourHours: [0, 1000], topUpLitresPerHour: [0, 100],
};
const OFFER: Record<string, [number, number]> = {
  modulePrice: [0, 1e10], installCost: [0, 1e10], coreCredit: [0, 1e10], downtimeDays: [0, 365], productivityGain: [0, 1],
};
const TRUCK: Record<string, [number, number]> = {
  engineHours: [0, 1_000_000], remainingLifeHours: [1e-9, 500_000], annualHours: [1, 8784], loadFactor: [1e-9, 1],
  tonnesPerHour: [1e-9, 100_000],
};
const ASSUMPTIONS: Record<string, [number, number]> = {
  discountRate: [-0.99 + 1e-9, 1], inflation: [-0.5 + 1e-9, 1], fuelPrice: [0, 1e10], fuelEscalation: [-0.5 + 1e-9, 1],
  fuelDensityKgPerL: [0.3, 1.5], co2KgPerLitre: [0, 10], lubePrice: [0, 1e10], labourRate: [0, 1e10], carbonPrice: [0, 1e10],
  carbonEscalation: [-0.5 + 1e-9, 1], marginPerTonne: [0, 1e10], taxRate: [0, 1 - 1e-9],
};

/** min, max, or (a quarter of the time) a value between them. */
const atBound = ([lo, hi]: [number, number]) =>
  fc.oneof(fc.constant(lo), fc.constant(hi), fc.double({ min: lo, max: hi, noNaN: true, noDefaultInfinity: true }));
const recordOf = (table: Record<string, [number, number]>) =>
  fc.record(Object.fromEntries(Object.entries(table).map(([k, r]) => [k, atBound(r)])) as Record<string, fc.Arbitrary<number>>);

const caseArb = fc
  .record({
    engines: fc.tuple(recordOf(ENGINE), recordOf(ENGINE)),
    offer: recordOf(OFFER),
    truck: recordOf(TRUCK),
    a: recordOf(ASSUMPTIONS),
    fuelBurn: fc.option(atBound([1e-9, 10_000]), { nil: null }),
    horizon: fc.constantFrom<number | null>(null, 1, 100),
    midYear: fc.boolean(),
    capitalise: fc.boolean(),
    timing: fc.constantFrom('at-overhaul' as const, 'now' as const),
    depreciation: fc.constantFrom<CaseFileInput['assumptions']['depreciation']>(
      { method: 'none' },
      { method: 'straight-line', years: 1 },
      { method: 'straight-line', years: 100 },
      { method: 'declining-balance', years: 100, factor: 10 },
      { method: 'declining-balance', years: 10, factor: 10 },
      { method: 'macrs', years: 20 },
    ),
  })
  .map((v) => {
    const c = structuredClone(base);
    c.engines.forEach((e, i) => Object.assign(e, v.engines[i]));
    const o = c.repowerOffers[0];
    Object.assign(o, v.offer, { timing: v.timing });
    o.coreCredit = Math.min(o.coreCredit, o.modulePrice + o.installCost); // the rule: no negative capital cost
    Object.assign(c.trucks[0], v.truck, { fuelBurnLitresPerHour: v.fuelBurn });
    Object.assign(c.assumptions, v.a, {
      horizonYears: v.horizon,
      timing: v.midYear ? 'mid-year' : 'end-of-year',
      rebuildAccounting: v.capitalise ? 'capitalise' : 'expense',
      depreciation: v.depreciation,
    });
    const t = c.trucks[0];
    // more than 100 years with no cap is refused: then cap it, as the message asks
    if (v.horizon === null && t.remainingLifeHours / t.annualHours > 100) c.assumptions.horizonYears = 100;
    return c;
  });

describe('issue 12: a case at the bounds of every range', () => {
  it('validates, finishes with finite numbers and books fewer events than the cap', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const v = validateCase(c);
        expect(v.ok ? [] : v.problems).toEqual([]);
        const { result, details } = evaluateCaseDetailed(c);
        const truck = result.trucks[0];
        expect(truck.horizonYears).toBeLessThanOrEqual(100);
        for (const p of POLICIES) {
          const option = truck.options[p];
          expect(Number.isFinite(option.npv)).toBe(true);
          expect(option.cashFlows.every(Number.isFinite)).toBe(true);
          const detail = details[0].policies[p];
          expect(detail.events.length).toBeLessThan(MAX_EVENTS_PER_RUN);
          // one segment ends at each event or at a year's end: the work of the run is bounded
          expect(detail.segments.length).toBeLessThanOrEqual(detail.events.length + truck.horizonYears);
        }
        const npvs = evaluateNpvs(c);
        for (const p of POLICIES) expect(npvs[p][0]).toBe(truck.options[p].npv);
      }),
      { numRuns: 60, seed: 12 },
    );
  });

  it('the fewest hours between events at the bounds: a 500 h scale at shape 0.5 over 500,000 h stays far under the cap', () => {
    const c = structuredClone(base);
    for (const e of c.engines) Object.assign(e, { weibullShape: 0.5, weibullScaleHours: 500, lifeHours: 500 });
    Object.assign(c.trucks[0], { engineHours: 0, remainingLifeHours: 500_000, annualHours: 8784 });
    const { details } = evaluateCaseDetailed(c);
    for (const p of POLICIES) {
      const n = details[0].policies[p].events.length;
      // median life 500·(ln 2)² ≈ 240 h: about 500,000 / 240 ≈ 2,080 events
      expect(n).toBeGreaterThan(2000);
      expect(n).toBeLessThan(MAX_EVENTS_PER_RUN);
    }
  });
});
