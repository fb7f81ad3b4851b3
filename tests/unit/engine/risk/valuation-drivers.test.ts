/**
 * The drivers of the new case fields (productivityGain, failedCoreCredit,
 * lostMarginShare): read with the model's defaults when the case leaves them
 * out, listed for the analyses, and every figure equal to the engine re-run on
 * a copy of the case with the field changed by hand.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase, validateCase } from '@/lib/engine';
import { DRIVER_CATALOGUE, getDriver, listDrivers, makeEvaluator, setDriver, cloneCase, tornado } from '@/lib/engine/sensitivity';
import type { CaseFileInput } from '@/lib/validation/case';

const read = (f: string) => JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios', f), 'utf8'));
const oneTruck = read('one-truck.json');
/** one-truck.json with an old engine that fails (median path: at 18,481 h, before its 20,000 h life), so the swap is unplanned. */
function failing(): CaseFileInput {
  const c = structuredClone(oneTruck);
  c.engines[0].weibullScaleHours = 10000;
  c.engines[0].weibullShape = 2;
  c.repowerOffers[0].failedCoreCredit = 40000;
  c.assumptions.valuation = 'median-path';
  return c;
}
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- edits reach into plain JSON
const repowerNpv = (c: any) => evaluateCase(c).trucks[0].options.repower.npv;
const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(b)));

describe('drivers of the new fields', () => {
  it('are in the catalogue with the case file’s ranges', () => {
    expect(DRIVER_CATALOGUE.productivityGain).toMatchObject({ scope: 'offer', min: 0, max: 1 });
    expect(DRIVER_CATALOGUE.failedCoreCredit).toMatchObject({ scope: 'offer', min: 0, max: 1e10 });
    expect(DRIVER_CATALOGUE.lostMarginShare).toMatchObject({ scope: 'assumption', min: 0, max: 1 });
  });

  it('read the model defaults when the case leaves the fields out', () => {
    const c = structuredClone(oneTruck);
    delete c.repowerOffers[0].productivityGain;
    delete c.assumptions.lostMarginShare;
    expect(getDriver(c, { key: 'failedCoreCredit', target: 'offer-a' })).toBe(100000); // = coreCredit
    expect(getDriver(c, { key: 'productivityGain', target: 'offer-a' })).toBe(0);
    expect(getDriver(c, { key: 'lostMarginShare' })).toBe(1);
    expect(getDriver(failing(), { key: 'failedCoreCredit', target: 'offer-a' })).toBe(40000);
  });

  it('are listed for a truck and for the fleet', () => {
    const ids = (c: CaseFileInput, t?: string) => listDrivers(c, t).map((d) => (d.target ? `${d.key}@${d.target}` : d.key));
    for (const list of [ids(oneTruck, 'T-01'), ids(oneTruck)]) {
      expect(list).toEqual(expect.arrayContaining(['lostMarginShare', 'failedCoreCredit@offer-a', 'productivityGain@offer-a']));
    }
  });

  it('set values the engine then uses exactly as a hand edit of the case', () => {
    const base = failing();
    for (const [key, target, value, edit] of [
      ['failedCoreCredit', 'offer-a', 10000, (c: any) => (c.repowerOffers[0].failedCoreCredit = 10000)],
      ['productivityGain', 'offer-a', 0.03, (c: any) => (c.repowerOffers[0].productivityGain = 0.03)],
      ['lostMarginShare', undefined, 0.6, (c: any) => (c.assumptions.lostMarginShare = 0.6)],
    ] as const) {
      const work = cloneCase(base);
      setDriver(work, base, { key, target }, value);
      const byHand = structuredClone(base);
      edit(byHand);
      expect(work).toEqual(byHand);
      close(repowerNpv(work), repowerNpv(byHand));
    }
  });

  it('move the repower npv on a failed swap: each dollar of failed core credit, and less lost margin', () => {
    const base = failing();
    expect(validateCase(base).ok).toBe(true);
    const more = structuredClone(base);
    more.repowerOffers[0].failedCoreCredit = 50000;
    expect(repowerNpv(more)).toBeGreaterThan(repowerNpv(base));
    // on the planned swap (one-truck.json: no failure before the life) the failed core credit does not count
    const planned = structuredClone(oneTruck);
    const plannedMore = structuredClone(oneTruck);
    plannedMore.repowerOffers[0].failedCoreCredit = 1000;
    close(repowerNpv(plannedMore), repowerNpv(planned));
    const fewerLost = structuredClone(base);
    fewerLost.assumptions.lostMarginShare = 0;
    expect(repowerNpv(fewerLost)).toBeGreaterThan(repowerNpv(base));
  });

  it('appear in a tornado with end points equal to the engine re-run by hand', () => {
    const base = failing();
    const v = validateCase(base);
    if (!v.ok) throw new Error('invalid');
    const ev = makeEvaluator(v.value, { kind: 'truck-delta', truckId: 'T-01' });
    const rows = tornado(ev, [{ key: 'failedCoreCredit', target: 'offer-a' }, { key: 'lostMarginShare' }]);
    const fcc = rows.find((r) => r.driver === 'failedCoreCredit@offer-a')!;
    const rerun = (edit: (c: any) => void) => {
      const c = structuredClone(v.value) as any;
      edit(c);
      return evaluateCase(c).trucks[0].repowerVsRebuild.deltaNpv;
    };
    // realistic ranges (ranges.ts, from memory / common practice): failed core credit −50/+20 % of 40,000, share of lost margin −25 points of 1
    expect([fcc.low, fcc.high]).toEqual([20000, 48000]);
    close(fcc.metricHigh, rerun((c) => (c.repowerOffers[0].failedCoreCredit = 48000)));
    close(fcc.metricLow, rerun((c) => (c.repowerOffers[0].failedCoreCredit = 20000)));
    const lms = rows.find((r) => r.driver === 'lostMarginShare')!;
    expect([lms.low, lms.high]).toEqual([0.75, 1]);
    close(lms.metricLow, rerun((c) => (c.assumptions.lostMarginShare = 0.75)));
  });
});
