import fs from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { irrBlankReason } from '@/lib/cases/irr-reason';
import { summariseFleet } from '@/lib/cases/summary';
import { evaluateCase } from '@/lib/engine';
import { rankTrucks } from '@/lib/plan';

const demo = evaluateCase(JSON.parse(fs.readFileSync(path.resolve('scenarios/aldervane-north-pit.json'), 'utf8')));

describe('ranking and fleet summary of an evaluated case', () => {
  it('ranks by gain over the better other policy, which is the engine\'s ΔNPV of that comparison', () => {
    const ranked = rankTrucks(demo);
    expect(ranked.map((r) => r.rank)).toEqual(ranked.map((_, i) => i + 1));
    for (let i = 1; i < ranked.length; i++) expect(ranked[i - 1].gain).toBeGreaterThanOrEqual(ranked[i].gain);
    for (const r of ranked) {
      const t = demo.trucks.find((x) => x.id === r.truckId)!;
      const cmp = r.bestOther === 'keep' ? t.repowerVsKeep : t.repowerVsRebuild;
      expect(r.gain).toBeCloseTo(cmp.deltaNpv, 3);
      expect(Math.max(t.options.keep.npv, t.options.rebuild.npv)).toBe(t.options[r.bestOther].npv);
    }
  });

  it('adds capital by year up to the fleet\'s best-mix capital, and counts every truck once', () => {
    const s = summariseFleet(demo);
    expect(s.capitalByYear.reduce((a, c) => a + c.amount, 0)).toBeCloseTo(demo.fleet.capital.best, 2);
    expect(s.trucksByBest.keep + s.trucksByBest.rebuild + s.trucksByBest.repower).toBe(demo.trucks.length);
    // the best mix never burns more than rebuilding everything here, since every engine module has the lower BSFC
    expect(s.fuelSavedLitresPerYear).toBeGreaterThan(0);
  });

  it('says why an IRR is blank', () => {
    const base = { deltaNpv: 0, irr: null, mirr: null, paybackYears: null, discountedPaybackYears: null, profitabilityIndex: null };
    expect(irrBlankReason({ ...base, irrSignChanges: 0 })).toMatch(/^no investment/);
    expect(irrBlankReason({ ...base, irrSignChanges: 1 }, [0, 5, -3])).toMatch(/^no investment first/);
    expect(irrBlankReason({ ...base, irrSignChanges: 2 }, [-5, 8, -4])).toMatch(/^several sign changes/);
    expect(irrBlankReason({ ...base, irrSignChanges: 1 }, [-5, 1])).toMatch(/^no rate/);
    expect(irrBlankReason({ ...base, irr: 0.1, irrSignChanges: 1 })).toBeNull();
  });
});
