/**
 * The `proposal` metric: Σ over trucks of npv(the truck's policy in the
 * proposal) − npv(rebuild), the policies held fixed while inputs vary. Hand-
 * worked figures on made-up npvs (the arithmetic is written out beside each
 * check), then on the demo mine against the full engine re-run by hand.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase, validateCase } from '@/lib/engine';
import { createCaseNpvs } from '@/lib/engine/npv-only';
import { proposalSlots, summariseFleet, summariseRun } from '@/lib/engine/monte-carlo';
import { breakEvens, makeEvaluator, readMetric, tornado, twoWay } from '@/lib/engine/sensitivity';
import type { PolicyKey } from '@/lib/engine/types';

/** npvs (keep, rebuild, repower) by truck: A (10, 8, 12), B (5, 7, 4), C (0, 3, 9). */
function handNpvs() {
  const n = createCaseNpvs(3);
  n.truckIds.splice(0, 3, 'A', 'B', 'C');
  n.keep.set([10, 5, 0]);
  n.rebuild.set([8, 7, 3]);
  n.repower.set([12, 4, 9]);
  n.best.splice(0, 3, 'repower', 'rebuild', 'repower');
  return n;
}

describe('reading the proposal metric (hand-worked)', () => {
  const n = handNpvs();

  it('sums each truck\'s policy against rebuild: (12 − 8) + (5 − 7) + (3 − 3) = 2', () => {
    expect(readMetric(n, { kind: 'proposal', policies: { A: 'repower', B: 'keep', C: 'rebuild' } })).toBe(2);
  });

  it('counts a truck the proposal does not name as rebuilt: (9 − 3) = 6', () => {
    expect(readMetric(n, { kind: 'proposal', policies: { C: 'repower' } })).toBe(6);
  });

  it('equals repower-everything when every truck is repowered: (12 − 8) + (4 − 7) + (9 − 3) = 7, and 0 when every truck is rebuilt', () => {
    expect(readMetric(n, { kind: 'proposal', policies: { A: 'repower', B: 'repower', C: 'repower' } })).toBe(7);
    expect(readMetric(n, { kind: 'fleet-delta' })).toBe(7);
    expect(readMetric(n, { kind: 'proposal', policies: { A: 'rebuild', B: 'rebuild', C: 'rebuild' } })).toBe(0);
  });
});

describe('Monte Carlo summaries of a proposal (hand-worked)', () => {
  it('maps policies to npv slots (keep 0, rebuild 1, repower 2; unnamed → rebuild)', () => {
    expect(Array.from(proposalSlots(['A', 'B', 'C'], { A: 'repower', B: 'keep' }))).toEqual([2, 0, 1]);
  });

  it('gives each iteration the proposal\'s sum with the policies fixed, even where another policy became best', () => {
    // two iterations of A, B (keep, rebuild, repower):
    //   it. 1: A (10, 8, 12), B (5, 7, 4)  → proposal {A: repower, B: keep} = (12 − 8) + (5 − 7) = 2
    //   it. 2: A (10, 8,  6), B (9, 7, 4)  → (6 − 8) + (9 − 7) = 0 (A's repower now loses, yet stays proposed)
    const npvs = Float64Array.from([10, 8, 12, 5, 7, 4, 10, 8, 6, 9, 7, 4]);
    const fleet = summariseFleet(2, npvs, proposalSlots(['A', 'B'], { A: 'repower', B: 'keep' }));
    expect(fleet.proposalNpv?.count).toBe(2);
    expect(fleet.proposalNpv?.mean).toBe(1);
    expect([fleet.proposalNpv?.min, fleet.proposalNpv?.max]).toEqual([0, 2]);
    expect(fleet.proposalNpv?.probNegative).toBe(0);
    // beside it, repower everything: it. 1 (4 − 3) = 1, it. 2 (−2 − 3) = −5, mean −2
    expect(fleet.deltaNpv.mean).toBe(-2);
    // without a proposal there is no proposal figure
    expect(summariseFleet(2, npvs).proposalNpv).toBeUndefined();
    expect(summariseRun(['A', 'B'], npvs, { A: 'repower', B: 'keep' }).fleet.proposalNpv?.mean).toBe(1);
  });
});

describe('the proposal metric on the demo mine, against the full engine re-run by hand', () => {
  const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8'));
  const v = validateCase(raw);
  if (!v.ok) throw new Error('demo case invalid');
  const demo = v.value;
  const result = evaluateCase(demo);
  // a mixed proposal: the first four trucks repowered, the fifth kept, the rest rebuilt
  const policies: Record<string, PolicyKey> = {};
  demo.trucks.forEach((t, i) => (policies[t.id] = i < 4 ? 'repower' : i === 4 ? 'keep' : 'rebuild'));
  const metric = { kind: 'proposal' as const, policies };
  const gain = (r: ReturnType<typeof evaluateCase>) => r.trucks.reduce((s, t) => s + t.options[policies[t.id]].npv - t.options.rebuild.npv, 0);
  const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(b)));

  it('starts at Σ npv(policy) − npv(rebuild) of the engine\'s own result', () => {
    close(makeEvaluator(demo, metric).baseValue, gain(result));
  });

  it('holds the policies fixed when the fuel price moves (tornado end points = the engine re-run at the realistic fuel range, ±25 %, ranges.ts)', () => {
    const ev = makeEvaluator(demo, metric);
    const [row] = tornado(ev, [{ key: 'fuelPrice' }]);
    const at = (f: number) => {
      const c = JSON.parse(JSON.stringify(demo));
      c.assumptions.fuelPrice = demo.assumptions.fuelPrice * f;
      return gain(evaluateCase(c));
    };
    close(row.metricLow, at(0.75));
    close(row.metricHigh, at(1.25));
  });

  it('equals repower-everything when every truck is repowered, and is 0 at every input when every truck is rebuilt', () => {
    const all = Object.fromEntries(demo.trucks.map((t) => [t.id, 'repower' as PolicyKey]));
    close(makeEvaluator(demo, { kind: 'proposal', policies: all }).baseValue, makeEvaluator(demo, { kind: 'fleet-delta' }).baseValue);
    const none = Object.fromEntries(demo.trucks.map((t) => [t.id, 'rebuild' as PolicyKey]));
    const ev = makeEvaluator(demo, { kind: 'proposal', policies: none });
    const grid = twoWay(ev, { key: 'fuelPrice' }, { key: 'discountRate' });
    expect(grid.metric.flat().every((x) => x === 0)).toBe(true);
  });

  it('is a Δnpv metric: break-even finds the module price at which the proposal stops beating rebuilding', () => {
    // one truck repowered, the rest rebuilt: at a module price of 0 the repower gains (its fuel and rebuild savings),
    // at ten times the quoted price it cannot, so the proposal crosses zero in between
    const first = demo.trucks[0];
    const ev = makeEvaluator(demo, { kind: 'proposal', policies: { [first.id]: 'repower' } });
    const offer = demo.repowerOffers.find((o) => o.id === first.repowerOfferId)!;
    const d = { key: 'modulePrice' as const, target: offer.id };
    expect(ev.at([[d, 0]])).toBeGreaterThan(0);
    expect(ev.at([[d, offer.modulePrice * 10]])).toBeLessThan(0);
    const [row] = breakEvens(ev, [d], { [`modulePrice@${offer.id}`]: [0, offer.modulePrice * 10] });
    expect(row.kind).toBe('crossing');
    expect(Math.abs(ev.at([[d, row.value!]]))).toBeLessThan(1);
  });

  it('refuses a proposal naming a truck the case does not hold', () => {
    expect(() => makeEvaluator(demo, { kind: 'proposal', policies: { 'no-such-truck': 'repower' } })).toThrow(/not in the case/);
  });
});
