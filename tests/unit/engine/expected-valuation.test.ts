/**
 * The expected valuation (MODEL.md section 11; lib/engine/expected.ts and
 * renewal.ts). Expected values come from published closed forms, named beside
 * each check; the convergence checks compare the engine with itself on finer
 * grids (the error bound the module claims).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { gamma } from 'mathjs';
import { afterEach, describe, expect, it } from 'vitest';
import { evaluateCase, evaluateCaseDetailed, evaluateNpvs } from '@/lib/engine';
import { buildRenewalTable, readTable, setGridRefinement } from '@/lib/engine/renewal';
import type { CaseFileInput } from '@/lib/validation/case';

const load = (name: string): CaseFileInput => JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios', name), 'utf8'));
const oneTruck = load('one-truck.json');
const demo = load('aldervane-north-pit.json');
const POLICIES = ['keep', 'rebuild', 'repower'] as const;

function expectedCase(base: CaseFileInput, edit?: (c: CaseFileInput) => void): CaseFileInput {
  const c = structuredClone(base);
  c.assumptions.valuation = 'expected';
  edit?.(c);
  return c;
}

afterEach(() => {
  setGridRefinement(1);
});

describe('renewal functions against closed forms', () => {
  it('exponential lives (β = 1), kept to failure: U(t) = t/η (the Poisson process; Ross, Introduction to Probability Models, ch. 7)', () => {
    const eta = 10000;
    const t = buildRenewalTable({ weibullShape: 1, weibullScaleHours: eta, lifeHours: 20000, serviceIntervalHours: 250 }, 'keep', 25, 4000);
    for (const hours of [1000, 5000, 37000, 99000]) expect(Math.abs(readTable(t.U, t.h, hours) - hours / eta)).toBeLessThan(2e-6 * Math.max(1, hours / eta));
  });

  it('Weibull lives: U(t) − t/μ → (σ² − μ²)/(2μ²), μ = ηΓ(1 + 1/β), σ² = η²Γ(1 + 2/β) − μ² (Cox, Renewal Theory, 1962, §4.5; Γ from mathjs)', () => {
    for (const beta of [2, 3.2]) {
      const eta = 20000;
      const mu = eta * (gamma(1 + 1 / beta) as number);
      const variance = eta * eta * (gamma(1 + 2 / beta) as number) - mu * mu;
      const t = buildRenewalTable({ weibullShape: beta, weibullScaleHours: eta, lifeHours: 1e5, serviceIntervalHours: 250 }, 'keep', eta / 400, 8 * mu);
      const at = 8 * mu;
      expect(Math.abs(readTable(t.U, t.h, at) - at / mu - (variance - mu * mu) / (2 * mu * mu))).toBeLessThan(1e-4);
    }
  });

  it('the Weibull mean life η·Γ(1 + 1/β) equals the published Γ(1.5) = √π/2 for β = 2 (Abramowitz & Stegun 6.1.9)', () => {
    expect(20000 * (gamma(1.5) as number)).toBeCloseTo(20000 * Math.sqrt(Math.PI) / 2, 6);
  });
});

describe('expected figures of one truck against closed forms', () => {
  it('keep on exponential engines books H_y/η repairs a year (memoryless: whatever the engine hours today)', () => {
    const c = expectedCase(oneTruck, (x) => {
      x.engines[0].weibullShape = 1;
      x.engines[0].weibullScaleHours = 10000;
    });
    const keep = evaluateCase(c).trucks[0].options.keep;
    expect(keep.events.map((e) => e.repairs)).toEqual([0, expect.any(Number), expect.any(Number), expect.any(Number)]);
    for (let y = 1; y <= 3; y++) expect(Math.abs(keep.events[y].repairs - 6000 / 10000)).toBeLessThan(1e-5);
    // lost margin and repair cost are linear in the count: 0.6 repairs at 1,350,000 and 28 days, year-1 prices
    expect(keep.breakdown[1].failures).toBeCloseTo(-0.6 * 1350000, 0);
    expect(keep.breakdown[1].lostMargin).toBeCloseTo(-0.6 * 28 * (6000 / 365) * 850 * 2.5, 0);
  });

  it('failureBeforePlanned is 1 − R(a0 + T)/R(a0) under keep and 1 − R(ℓ)/R(a0) under rebuild and repower (MODEL.md section 11)', () => {
    const c = expectedCase(oneTruck);
    const r = evaluateCase(c).trucks[0].options;
    const H = (x: number) => Math.pow(x / 24000, 3.2);
    expect(Math.abs(r.keep.failureBeforePlanned - -Math.expm1(H(16500) - H(16500 + 18000)))).toBeLessThan(1e-9);
    expect(Math.abs(r.rebuild.failureBeforePlanned - -Math.expm1(H(16500) - H(20000)))).toBeLessThan(1e-9);
    expect(r.repower.failureBeforePlanned).toBe(r.rebuild.failureBeforePlanned);
    // the planned event: an overhaul (rebuild) or the planned swap (repower) with probability R(ℓ)/R(a0), in year 1
    const planned = Math.exp(H(16500) - H(20000));
    expect(Math.abs(r.rebuild.events[1].overhauls - planned)).toBeLessThan(1e-9);
    expect(Math.abs(r.repower.events[1].repowers - 1)).toBeLessThan(1e-9); // planned or failed, the swap is in year 1
  });

  it('an engine past life (rebuild) and a repower now have their event in period 0 and failureBeforePlanned 0', () => {
    const past = evaluateCase(expectedCase(oneTruck, (x) => (x.trucks[0].engineHours = 21000))).trucks[0].options;
    expect(past.rebuild.events[0]).toEqual({ overhauls: 1, repairs: 0, repowers: 0 });
    expect(past.rebuild.failureBeforePlanned).toBe(0);
    expect(past.repower.events[0]).toEqual({ overhauls: 0, repairs: 0, repowers: 1 });
    const now = evaluateCase(expectedCase(oneTruck, (x) => (x.repowerOffers[0].timing = 'now'))).trucks[0].options.repower;
    expect(now.events[0].repowers).toBe(1);
    expect(now.failureBeforePlanned).toBe(0);
  });

  it('the failed swap of MODEL.md section 3 is costed at its probability: capital = P(planned)·(price − core) + P(failed)·(price − failed core)', () => {
    const c = expectedCase(oneTruck, (x) => (x.repowerOffers[0].failedCoreCredit = 40000));
    const r = evaluateCase(c).trucks[0].options.repower;
    const H = (x: number) => Math.pow(x / 24000, 3.2);
    const planned = Math.exp(H(16500) - H(20000));
    expect(r.breakdown[1].capital).toBeCloseTo(-(planned * 1540000 + (1 - planned) * 1600000), 2);
  });
});

describe('consistency', () => {
  it('evaluateNpvs gives the npvs of evaluateCase under the expected valuation', () => {
    const c = expectedCase(demo);
    const full = evaluateCase(c);
    const lean = evaluateNpvs(c);
    full.trucks.forEach((t, i) => {
      for (const p of POLICIES) expect(lean[p][i]).toBe(t.options[p].npv);
    });
  });

  it('each period\'s categories add up to its cash flow and the npv is Σ CF·DF', () => {
    const c = expectedCase(demo, (x) => (x.assumptions.rebuildAccounting = 'capitalise'));
    const { result } = evaluateCaseDetailed(c);
    const r = c.assumptions.discountRate;
    for (const t of result.trucks) {
      for (const p of POLICIES) {
        const o = t.options[p];
        o.breakdown.forEach((b, y) => {
          const sum = Object.values(b).reduce((s, v) => s + v, 0);
          expect(Math.abs(sum - o.cashFlows[y])).toBeLessThan(1e-6 * Math.max(1, Math.abs(o.cashFlows[y])));
        });
        const npv = o.cashFlows.reduce((s, v, y) => s + v / Math.pow(1 + r, y), 0);
        expect(Math.abs(npv - o.npv)).toBeLessThan(1e-7 * Math.abs(o.npv));
      }
    }
  });

  it('the median path is still available and differs from the expectation', () => {
    const median = evaluateCase(expectedCase(demo, (x) => (x.assumptions.valuation = 'median-path')));
    const expected = evaluateCase(expectedCase(demo));
    for (const t of median.trucks) for (const p of POLICIES) expect([0, 1]).toContain(t.options[p].failureBeforePlanned);
    expect(expected.trucks.some((t, i) => Math.abs(t.options.rebuild.npv - median.trucks[i].options.rebuild.npv) > 1000)).toBe(true);
  });
});

describe('convergence: halving the grid step moves no expected figure by more than the claimed bound', () => {
  const variants: [string, CaseFileInput][] = [
    ['demo', expectedCase(demo)],
    ['demo, capitalised, mid-year, 10-year cap', expectedCase(demo, (x) => {
      x.assumptions.rebuildAccounting = 'capitalise';
      x.assumptions.timing = 'mid-year';
      x.assumptions.horizonYears = 10;
    })],
    ['one truck, failing engine, failed core credit, half the lost margin', expectedCase(oneTruck, (x) => {
      x.engines[0].weibullShape = 2;
      x.engines[0].weibullScaleHours = 10000;
      x.repowerOffers[0].failedCoreCredit = 40000;
      x.assumptions.lostMarginShare = 0.5;
      x.trucks[0].remainingLifeHours = 60000;
    })],
    ['one truck, β = 0.7 and β = 12', expectedCase(oneTruck, (x) => {
      x.engines[0].weibullShape = 0.7;
      x.engines[1].weibullShape = 12;
      x.trucks[0].remainingLifeHours = 60000;
    })],
    ['one truck, β = 0.5 (the smallest shape the case file takes) on both engines', expectedCase(oneTruck, (x) => {
      x.engines[0].weibullShape = 0.5;
      x.engines[1].weibullShape = 0.5;
      x.trucks[0].remainingLifeHours = 60000;
    })],
  ];
  for (const [name, c] of variants) {
    it(name, () => {
      setGridRefinement(1);
      const coarse = evaluateCase(c);
      setGridRefinement(2);
      const fine = evaluateCase(c);
      coarse.trucks.forEach((t, i) => {
        const f = fine.trucks[i];
        const money = 1e-5 * (Math.abs(f.options.rebuild.npv) + 1);
        for (const p of POLICIES) {
          const a = t.options[p];
          const b = f.options[p];
          expect(Math.abs(a.npv - b.npv), `${t.id} ${p} npv`).toBeLessThan(money);
          a.cashFlows.forEach((v, y) => expect(Math.abs(v - b.cashFlows[y]), `${t.id} ${p} CF${y}`).toBeLessThan(money));
          a.events.forEach((e, y) => {
            for (const k of ['overhauls', 'repairs', 'repowers'] as const) expect(Math.abs(e[k] - b.events[y][k]), `${t.id} ${p} ${k} ${y}`).toBeLessThan(1e-5);
          });
          expect(Math.abs(a.fuelLitres - b.fuelLitres)).toBeLessThan(1e-5 * b.fuelLitres);
        }
      });
    });
  }
});

describe('accuracy at small Weibull shapes (MODEL.md section 11: counts within 1e-5, money within 1e-5 · (|npv of rebuild| + 1), fuel 1e-5 relative)', () => {
  // The exact expectation is taken as the grid refined 4 times: the scheme converges at order 1.5 to 2 for
  // β < 1 (each halving divides the error by 3 to 4), so the refined grid's own error is at most about a
  // ninth of the default's, and the default must be within 0.85 of the bound of it.
  for (const beta of [0.5, 0.6, 0.8]) {
    it(`β = ${beta} on both engines, 60,000 h`, () => {
      const c = expectedCase(oneTruck, (x) => {
        x.engines[0].weibullShape = beta;
        x.engines[1].weibullShape = beta;
        x.trucks[0].remainingLifeHours = 60000;
      });
      setGridRefinement(1);
      const coarse = evaluateCase(c).trucks[0];
      setGridRefinement(4);
      const exact = evaluateCase(c).trucks[0];
      const share = 0.85;
      const money = share * 1e-5 * (Math.abs(exact.options.rebuild.npv) + 1);
      for (const p of POLICIES) {
        const a = coarse.options[p];
        const b = exact.options[p];
        expect(Math.abs(a.npv - b.npv), `${p} npv`).toBeLessThan(money);
        a.cashFlows.forEach((v, y) => expect(Math.abs(v - b.cashFlows[y]), `${p} CF${y}`).toBeLessThan(money));
        a.events.forEach((e, y) => {
          for (const k of ['overhauls', 'repairs', 'repowers'] as const) expect(Math.abs(e[k] - b.events[y][k]), `${p} ${k} ${y}`).toBeLessThan(share * 1e-5);
        });
        expect(Math.abs(a.failureBeforePlanned - b.failureBeforePlanned)).toBeLessThan(share * 1e-5);
        expect(Math.abs(a.fuelLitres - b.fuelLitres)).toBeLessThan(share * 1e-5 * b.fuelLitres);
        expect(Math.abs(a.tonnes - b.tonnes)).toBeLessThan(share * 1e-5 * b.tonnes);
      }
    }, 120_000);
  }
});
