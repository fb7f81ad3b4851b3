/**
 * Properties of the engine checked with fast-check on generated cases and
 * cash flows.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { BREAKDOWN_CATEGORIES, evaluateCase, evaluateCaseDetailed, findIrrRoots, irr, npv, sampleWeibullAge, scanIrrRoots, type FailureAgeContext } from '@/lib/engine';
import type { CaseFileInput } from '@/lib/validation/case';

const base: CaseFileInput = JSON.parse(
  readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'),
);

/** A valid case around the one-truck scenario, varied in the numbers that shape events and money. */
const caseArb: fc.Arbitrary<CaseFileInput> = fc
  .record({
    engineHours: fc.integer({ min: 0, max: 30000 }),
    remainingLifeHours: fc.integer({ min: 500, max: 80000 }),
    annualHours: fc.integer({ min: 2000, max: 7500 }),
    loadFactor: fc.double({ min: 0.3, max: 0.7, noNaN: true }),
    measured: fc.option(fc.double({ min: 150, max: 350, noNaN: true }), { nil: null }),
    discountRate: fc.double({ min: 0, max: 0.2, noNaN: true }),
    taxRate: fc.double({ min: 0, max: 0.45, noNaN: true }),
    inflation: fc.double({ min: 0, max: 0.06, noNaN: true }),
    newBsfc: fc.integer({ min: 180, max: 240 }),
    newLife: fc.integer({ min: 8000, max: 30000 }),
    gain: fc.double({ min: 0, max: 0.05, noNaN: true }),
    timing: fc.constantFrom('at-overhaul' as const, 'now' as const),
    midYear: fc.boolean(),
    capitalise: fc.boolean(),
    horizon: fc.option(fc.integer({ min: 1, max: 15 }), { nil: null }),
    carbonPrice: fc.double({ min: 0, max: 80, noNaN: true }),
    method: fc.constantFrom<CaseFileInput['assumptions']['depreciation']>(
      { method: 'none' },
      { method: 'straight-line', years: 5 },
      { method: 'declining-balance', years: 6, factor: 2 },
      { method: 'macrs', years: 7 },
    ),
  })
  .map((v) => {
    const c = structuredClone(base);
    Object.assign(c.trucks[0], {
      engineHours: v.engineHours,
      remainingLifeHours: v.remainingLifeHours,
      annualHours: v.annualHours,
      loadFactor: v.loadFactor,
      fuelBurnLitresPerHour: v.measured,
    });
    Object.assign(c.assumptions, {
      discountRate: v.discountRate,
      taxRate: v.taxRate,
      inflation: v.inflation,
      timing: v.midYear ? 'mid-year' : 'end-of-year',
      rebuildAccounting: v.capitalise ? 'capitalise' : 'expense',
      horizonYears: v.horizon,
      carbonPrice: v.carbonPrice,
      depreciation: v.method,
    });
    c.engines[1].bsfcGPerKwh = v.newBsfc;
    c.engines[1].lifeHours = v.newLife;
    c.repowerOffers[0].productivityGain = v.gain;
    c.repowerOffers[0].timing = v.timing;
    return c;
  });

/** flows of 2–12 periods, the first one negative */
const flowsArb = fc
  .tuple(
    fc.double({ min: -1e6, max: -1, noNaN: true }),
    fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 11 }),
  )
  .map(([first, rest]) => [first, ...rest]);

describe('irr properties', () => {
  it('npv(irr(x), x) = 0 whenever irr exists', () => {
    fc.assert(
      fc.property(flowsArb, (x) => {
        const rate = irr(x);
        if (rate === null) return;
        const scale = x.reduce((s, v, t) => s + Math.abs(v) / (1 + rate) ** t, 0);
        expect(Math.abs(npv(rate, x))).toBeLessThanOrEqual(1e-9 * scale);
      }),
      { numRuns: 500 },
    );
  });

  it('the fast root search finds exactly the roots of the full grid scan', () => {
    fc.assert(
      fc.property(flowsArb, (x) => {
        expect(findIrrRoots(x)).toEqual(scanIrrRoots(x));
      }),
      { numRuns: 300 },
    );
  });

  it('the fast root search finds exactly the scan\'s roots where the flows change sign once (investment, then returns)', () => {
    // negatives (or zeros) first, then positives (or zeros): one sign change, the path that brackets on the grid's ends
    const oneChange = fc
      .tuple(
        fc.array(fc.oneof(fc.constant(0), fc.double({ min: -1e6, max: -1e-3, noNaN: true })), { minLength: 1, maxLength: 6 }),
        fc.array(fc.oneof(fc.constant(0), fc.double({ min: 1e-3, max: 1e6, noNaN: true })), { minLength: 1, maxLength: 10 }),
        fc.double({ min: -1e6, max: -1e-3, noNaN: true }),
        fc.double({ min: 1e-3, max: 1e6, noNaN: true }),
      )
      .map(([neg, pos, n, p]) => [...neg, n, p, ...pos]);
    let found = 0;
    fc.assert(
      fc.property(oneChange, (x) => {
        const roots = scanIrrRoots(x);
        found += roots.length;
        expect(findIrrRoots(x)).toEqual(roots);
        expect(findIrrRoots(x, 1)).toEqual(roots.slice(0, 1));
      }),
      { numRuns: 300 },
    );
    expect(found).toBeGreaterThan(100); // most such flows have their one rate on the grid
  });

  it('the fast root search agrees with the scan on engine ΔCF too', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const t = evaluateCase(c).trucks[0];
        const pairs = [
          ['repower', 'rebuild'],
          ['repower', 'keep'],
          ['rebuild', 'keep'],
        ] as const;
        for (const [a, b] of pairs) {
          const d = t.options[a].cashFlows.map((v, y) => v - t.options[b].cashFlows[y]);
          expect(findIrrRoots(d)).toEqual(scanIrrRoots(d));
        }
      }),
      { numRuns: 60 },
    );
  });
});

describe('case properties', () => {
  it("each period's breakdown adds up to its cash flow", () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        for (const option of Object.values(evaluateCase(c).trucks[0].options)) {
          option.breakdown.forEach((b, y) => {
            const sum = BREAKDOWN_CATEGORIES.reduce((s, k) => s + b[k], 0);
            expect(Math.abs(sum - option.cashFlows[y])).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(sum)));
          });
        }
      }),
      { numRuns: 150 },
    );
  });

  it('each policy\'s npv (summed by kind as the simulation runs) is Σ CF_y·DF_y of its cash-flow table, within 1e-9', () => {
    fc.assert(
      fc.property(caseArb, fc.option(fc.array(fc.double({ min: 0.001, max: 0.999, noNaN: true }), { minLength: 12, maxLength: 12 }), { nil: null }), (c, us) => {
        // with a list of uniforms, failures are sampled (more events, repairs, capitalised spends) instead of the median path
        const failureAge = us
          ? (ctx: FailureAgeContext) => sampleWeibullAge(us[ctx.lifeIndex % us.length], ctx.engine.weibullShape, ctx.engine.weibullScaleHours, ctx.startAge)
          : undefined;
        const { result, details } = evaluateCaseDetailed(c, { failureAge });
        for (const p of ['keep', 'rebuild', 'repower'] as const) {
          const periods = details[0].policies[p].periods;
          let sum = 0;
          let scale = 0;
          for (const per of periods) {
            sum += per.cashFlow * per.discountFactor;
            scale += Math.abs(per.cashFlow * per.discountFactor);
          }
          expect(Math.abs(result.trucks[0].options[p].npv - sum)).toBeLessThanOrEqual(1e-9 * scale + 1e-9);
        }
      }),
      { numRuns: 300 },
    );
  });

  it('scaling every money input by k scales every npv by k', () => {
    fc.assert(
      fc.property(caseArb, fc.double({ min: 0.01, max: 100, noNaN: true }), (c, k) => {
        const scaled = structuredClone(c);
        const a = scaled.assumptions;
        a.fuelPrice *= k;
        a.lubePrice *= k;
        a.labourRate *= k;
        a.carbonPrice *= k;
        a.marginPerTonne *= k;
        for (const e of scaled.engines) {
          e.overhaulCost *= k;
          e.failureCost *= k;
          e.serviceKitCost *= k;
        }
        for (const o of scaled.repowerOffers) {
          o.modulePrice *= k;
          o.installCost *= k;
          o.coreCredit *= k;
        }
        const before = evaluateCase(c).trucks[0];
        const after = evaluateCase(scaled).trucks[0];
        for (const p of ['keep', 'rebuild', 'repower'] as const) {
          const want = k * before.options[p].npv;
          expect(Math.abs(after.options[p].npv - want)).toBeLessThanOrEqual(1e-9 * Math.abs(want) + 1e-6);
        }
        const wantDelta = k * before.repowerVsRebuild.deltaNpv;
        expect(Math.abs(after.repowerVsRebuild.deltaNpv - wantDelta)).toBeLessThanOrEqual(
          1e-9 * Math.abs(k * before.options.rebuild.npv) + 1e-6,
        );
      }),
      { numRuns: 100 },
    );
  });

  it('a dearer fuel never favours a repower to a thirstier engine, and never disfavours a thriftier one', () => {
    fc.assert(
      fc.property(caseArb, fc.double({ min: 0.01, max: 2, noNaN: true }), (c, rise) => {
        const dearer = structuredClone(c);
        dearer.assumptions.fuelPrice += rise;
        const d0 = evaluateCase(c).trucks[0].repowerVsRebuild.deltaNpv;
        const d1 = evaluateCase(dearer).trucks[0].repowerVsRebuild.deltaNpv;
        const tol = 1e-9 * Math.max(Math.abs(d0), Math.abs(d1)) + 1e-6;
        const newBurnsMore = c.engines[1].bsfcGPerKwh > c.engines[0].bsfcGPerKwh;
        const newBurnsLess = c.engines[1].bsfcGPerKwh < c.engines[0].bsfcGPerKwh;
        if (newBurnsMore) expect(d1).toBeLessThanOrEqual(d0 + tol);
        if (newBurnsLess) expect(d1).toBeGreaterThanOrEqual(d0 - tol);
        if (!newBurnsMore && !newBurnsLess) expect(Math.abs(d1 - d0)).toBeLessThanOrEqual(tol);
      }),
      { numRuns: 150 },
    );
  });

  it('every result is a finite number or null', () => {
    fc.assert(
      fc.property(caseArb, (c) => {
        const text = JSON.stringify(evaluateCase(c));
        expect(text).not.toMatch(/NaN|Infinity/);
        JSON.parse(text, (_k, v) => {
          if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
          return v;
        });
      }),
      { numRuns: 100 },
    );
  });
});
