/**
 * Tornado, spider, two-way and break-even against the engine itself: every
 * figure must equal evaluateCase re-run on a copy of the case with that
 * driver changed by hand.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase, validateCase } from '@/lib/engine';
import {
  breakEven,
  breakEvens,
  findRoot,
  getDriver,
  listDrivers,
  makeEvaluator,
  parseDriverId,
  spider,
  tornado,
  twoWay,
  type DriverRef,
} from '@/lib/engine/sensitivity';

const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8'));
const v = validateCase(raw);
if (!v.ok) throw new Error('demo case invalid');
const demo = v.value;
const TRUCK = demo.trucks[5].id;

/** The case with one driver set by hand (not through setDriver), evaluated by the full engine. */
// eslint-disable-next-line @typescript-eslint/no-explicit-any -- edits reach into plain JSON
function rerun(edit: (c: any) => void) {
  const c = JSON.parse(JSON.stringify(demo));
  edit(c);
  return evaluateCase(c);
}
const truckDelta = (r: ReturnType<typeof evaluateCase>) => r.trucks.find((t) => t.id === TRUCK)!.repowerVsRebuild.deltaNpv;
const close = (a: number, b: number) => expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(b)));

describe('tornado', () => {
  const ev = makeEvaluator(demo, { kind: 'truck-delta', truckId: TRUCK });
  const drivers = listDrivers(demo, TRUCK);
  const rows = tornado(ev, drivers);

  it('lists the drivers sorted by swing, largest first', () => {
    expect(rows).toHaveLength(drivers.length);
    for (let i = 1; i < rows.length; i++) expect(rows[i - 1].swing).toBeGreaterThanOrEqual(rows[i].swing);
  });

  // realistic ranges (lib/engine/sensitivity/ranges.ts, docs/methodology.md): fuel price ±25 %, module price −10/+20 %,
  // annual hours −10/+5 % (common practice, as documented there)
  it('puts each end point where the engine lands when that driver is changed by hand (realistic ranges)', () => {
    const truck = demo.trucks.find((t) => t.id === TRUCK)!;
    const fuel = rows.find((r) => r.driver === 'fuelPrice')!;
    close(fuel.metricLow, truckDelta(rerun((c) => (c.assumptions.fuelPrice = demo.assumptions.fuelPrice * 0.75))));
    close(fuel.metricHigh, truckDelta(rerun((c) => (c.assumptions.fuelPrice = demo.assumptions.fuelPrice * 1.25))));
    const module = rows.find((r) => r.driver === `modulePrice@${truck.repowerOfferId}`)!;
    const offer = demo.repowerOffers.find((o) => o.id === truck.repowerOfferId)!;
    close(module.metricHigh, truckDelta(rerun((c) => (c.repowerOffers.find((o: { id: string }) => o.id === offer.id).modulePrice = offer.modulePrice * 1.2))));
    const hours = rows.find((r) => r.driver === `annualHours@${TRUCK}`)!;
    close(hours.metricLow, truckDelta(rerun((c) => (c.trucks.find((t: { id: string }) => t.id === TRUCK).annualHours = truck.annualHours * 0.9))));
  });

  it('keeps ±20 % on every driver as an option', () => {
    const [fuel] = tornado(ev, [{ key: 'fuelPrice' }], {}, 0.2);
    expect(fuel.low).toBeCloseTo(demo.assumptions.fuelPrice * 0.8, 12);
    close(fuel.metricLow, truckDelta(rerun((c) => (c.assumptions.fuelPrice = demo.assumptions.fuelPrice * 0.8))));
    close(fuel.metricHigh, truckDelta(rerun((c) => (c.assumptions.fuelPrice = demo.assumptions.fuelPrice * 1.2))));
  });

  it('searches a driver at 0 over its absolute range in both modes (carbon price 0 to 200 per t CO2)', () => {
    const noCarbon = JSON.parse(JSON.stringify(demo));
    noCarbon.assumptions.carbonPrice = 0;
    const ev0 = makeEvaluator(noCarbon, { kind: 'truck-delta', truckId: TRUCK });
    for (const mode of ['realistic', 0.2] as const) {
      const [row] = tornado(ev0, [{ key: 'carbonPrice' }], {}, mode);
      expect([row.low, row.high]).toEqual([0, 200]);
    }
  });

  it('takes the ranges the user sets, and the fleet best-mix npv as its metric', () => {
    const fleet = makeEvaluator(demo, { kind: 'fleet-best' });
    const [row] = tornado(fleet, [{ key: 'discountRate' }], { discountRate: { low: 0.05, high: 0.12 } });
    expect([row.low, row.high]).toEqual([0.05, 0.12]);
    close(row.metricLow, rerun((c) => (c.assumptions.discountRate = 0.05)).fleet.npv.best);
    close(row.metricHigh, rerun((c) => (c.assumptions.discountRate = 0.12)).fleet.npv.best);
  });

  it('scales every truck by one factor for an all-trucks driver', () => {
    const fleet = makeEvaluator(demo, { kind: 'fleet-delta' });
    const d: DriverRef = { key: 'loadFactor', target: '*' };
    const mean = getDriver(demo, d);
    const [row] = tornado(fleet, [d]);
    // realistic load factor range ±15 % (common practice, ranges.ts)
    const byHand = rerun((c) => c.trucks.forEach((t: { loadFactor: number }) => (t.loadFactor *= 1.15)));
    close(row.high, mean * 1.15);
    close(row.metricHigh, byHand.fleet.npv.repower - byHand.fleet.npv.rebuild);
  });
});

describe('spider and two-way table', () => {
  const ev = makeEvaluator(demo, { kind: 'truck-delta', truckId: TRUCK });
  it('gives the base metric at 0 % and the engine re-run elsewhere', () => {
    const [line] = spider(ev, [{ key: 'fuelPrice' }], [-0.1, 0, 0.3]);
    expect(line.points[1].metric).toBe(ev.baseValue);
    close(line.points[2].metric, truckDelta(rerun((c) => (c.assumptions.fuelPrice = demo.assumptions.fuelPrice * 1.3))));
  });
  it('fills each cell with both drivers set', () => {
    const t = twoWay(ev, { key: 'fuelPrice' }, { key: 'discountRate' }, [1, 1.2], [0.06, 0.1]);
    close(t.metric[1][0], truckDelta(rerun((c) => Object.assign(c.assumptions, { fuelPrice: 1.2, discountRate: 0.06 }))));
    close(t.metric[0][1], truckDelta(rerun((c) => Object.assign(c.assumptions, { fuelPrice: 1, discountRate: 0.1 }))));
  });
});

describe('break-even', () => {
  // the demo truck's repower may pay at any fuel price or discount rate in range; a module priced
  // at 95 % of its own break-even brings Δnpv near zero, so those drivers have a break-even too
  const offerId = demo.trucks.find((t) => t.id === TRUCK)!.repowerOfferId;
  const moduleBreakEven = breakEven(makeEvaluator(demo, { kind: 'truck-delta', truckId: TRUCK }), { key: 'modulePrice', target: offerId }).value!;
  const dearPrice = 0.95 * moduleBreakEven;
  const dear = JSON.parse(JSON.stringify(demo));
  dear.repowerOffers.find((o: { id: string }) => o.id === offerId).modulePrice = dearPrice;

  it('finds roots by bracketing (the doc example: √2)', () => {
    expect(findRoot((x) => x * x - 2, 0, 2).x).toBeCloseTo(Math.SQRT2, 9);
    expect(() => findRoot((x) => x * x + 1, 0, 2)).toThrow(/opposite signs/);
  });

  it.each(['fuelPrice', 'discountRate', 'modulePrice', 'bsfcGPerKwh'])(
    'gives a %s that, put back into the case, makes Δnpv of repower vs rebuild zero to 1e-6',
    (key) => {
      const truck = demo.trucks.find((t) => t.id === TRUCK)!;
      const offer = demo.repowerOffers.find((o) => o.id === truck.repowerOfferId)!;
      const target = key === 'modulePrice' ? offer.id : key === 'bsfcGPerKwh' ? offer.engineId : undefined;
      const d = parseDriverId(target ? `${key}@${target}` : key);
      const ev = makeEvaluator(dear, { kind: 'truck-delta', truckId: TRUCK });
      const be = breakEven(ev, d, key === 'bsfcGPerKwh' ? [150, 300] : undefined);
      expect(be.kind).toBe('crossing');
      const back = rerun((c) => {
        c.repowerOffers.find((o: { id: string }) => o.id === offerId).modulePrice = dearPrice;
        if (key === 'modulePrice') c.repowerOffers.find((o: { id: string }) => o.id === offer.id).modulePrice = be.value;
        else if (key === 'bsfcGPerKwh') c.engines.find((e: { id: string }) => e.id === offer.engineId).bsfcGPerKwh = be.value;
        else c.assumptions[key] = be.value;
      });
      expect(Math.abs(truckDelta(back))).toBeLessThanOrEqual(1e-6);
    },
  );

  it('says "none within the range" plainly, with the sign throughout', () => {
    const ev = makeEvaluator(demo, { kind: 'truck-delta', truckId: TRUCK });
    const base = demo.assumptions.fuelPrice;
    const [be] = breakEvens(ev, [{ key: 'fuelPrice' }], { fuelPrice: [base * 0.99, base * 1.01] });
    expect(be.kind).toBe('none');
    expect(be.value).toBeNull();
    expect(be.signThroughout).toBe(Math.sign(ev.baseValue));
  });
});
