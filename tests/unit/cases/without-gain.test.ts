/** ΔNPV without the productivity gain: the same case, every offer's gain at 0, by the same engine and valuation. */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase, validateCase, type CaseFile } from '@/lib/engine';
import { deltaNpvWithoutGain, withoutProductivityGain } from '@/lib/cases/without-gain';

function load(name: string): CaseFile {
  const v = validateCase(JSON.parse(readFileSync(path.join(__dirname, '../../../scenarios', name), 'utf8')));
  if (!v.ok) throw new Error('invalid scenario');
  return v.value;
}

describe('deltaNpvWithoutGain', () => {
  const demo = load('aldervane-north-pit.json');
  // the first four trucks keep the test quick; trucks are evaluated independently
  const ids = demo.trucks.slice(0, 4).map((t) => t.id);

  it('copies the case with every productivity gain at 0 and leaves the input alone', () => {
    const copy = withoutProductivityGain(demo, ids);
    expect(copy.repowerOffers.every((o) => o.productivityGain === 0)).toBe(true);
    expect(copy.trucks.map((t) => t.id)).toEqual(ids);
    expect(demo.repowerOffers.some((o) => o.productivityGain > 0)).toBe(true);
    expect(demo.trucks.length).toBeGreaterThan(4);
  });

  it('equals repower − rebuild of the zero-gain case evaluated in full, and the fleet figure is their sum', () => {
    const d = deltaNpvWithoutGain(demo, ids);
    const zero = { ...demo, trucks: demo.trucks.filter((t) => ids.includes(t.id)), repowerOffers: demo.repowerOffers.map((o) => ({ ...o, productivityGain: 0 })) };
    const full = evaluateCase(zero);
    let sum = 0;
    for (const t of full.trucks) {
      expect(d.trucks[t.id]).toBeCloseTo(t.repowerVsRebuild.deltaNpv, 4);
      sum += t.repowerVsRebuild.deltaNpv;
    }
    expect(d.fleet).toBeCloseTo(sum, 3);
    expect(d.anyGain).toBe(true);
    // a gain only adds tonnes under repower: without it the repower's ΔNPV is lower
    const withGain = evaluateCase({ ...demo, trucks: zero.trucks });
    for (const t of withGain.trucks) expect(d.trucks[t.id]).toBeLessThan(t.repowerVsRebuild.deltaNpv);
  });

  it('says when no offer of the trucks carries a gain', () => {
    const one = load('one-truck.json');
    const d = deltaNpvWithoutGain(one);
    expect(d.anyGain).toBe(false);
    const r = evaluateCase(one);
    expect(d.fleet).toBeCloseTo(r.trucks[0].repowerVsRebuild.deltaNpv, 4);
  });
});
