/**
 * The sensitivity evaluator re-evaluates only the trucks a driver touches
 * (lib/engine/sensitivity/touched.ts): on random cases drawn from the demo
 * mine, every run must give exactly (Object.is) the number of the plain
 * definition, the whole case re-evaluated with the drivers set
 * (makeFullEvaluator), for every metric and both valuations.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { validateCase } from '@/lib/engine';
import {
  clampDriver, getDriver, listDrivers, makeEvaluator, makeFullEvaluator, trucksTouched, type DriverRef, type Metric,
} from '@/lib/engine/sensitivity';
import type { CaseFileInput } from '@/lib/validation/case';

const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../../../scenarios/aldervane-north-pit.json'), 'utf8')) as CaseFileInput;

function valid(c: CaseFileInput): CaseFileInput {
  const v = validateCase(c);
  if (!v.ok) throw new Error(JSON.stringify(v.problems));
  return v.value;
}

describe('trucksTouched', () => {
  const demo = valid(raw);
  it('an assumption and "*" touch every truck; an offer its trucks; an engine the trucks that run it or get it', () => {
    expect(trucksTouched(demo, { key: 'fuelPrice' })).toBeNull();
    expect(trucksTouched(demo, { key: 'annualHours', target: '*' })).toBeNull();
    const offer = demo.trucks[0].repowerOfferId;
    expect(trucksTouched(demo, { key: 'modulePrice', target: offer })).toEqual(demo.trucks.flatMap((t, i) => (t.repowerOfferId === offer ? [i] : [])));
    const next = demo.repowerOffers.find((o) => o.id === offer)!.engineId;
    expect(trucksTouched(demo, { key: 'lifeHours', target: next })).toEqual(demo.trucks.flatMap((t, i) => (t.repowerOfferId === offer ? [i] : [])));
    expect(trucksTouched(demo, { key: 'loadFactor', target: demo.trucks[3].id })).toEqual([3]);
  });

  it('listDrivers leaves out an engine and an offer no truck uses', () => {
    const c = structuredClone(raw);
    c.engines.push({ ...c.engines[0], id: 'spare-engine' });
    c.repowerOffers.push({ ...c.repowerOffers[0], id: 'spare-offer' });
    const ids = listDrivers(valid(c)).map((d) => d.target);
    expect(ids).not.toContain('spare-engine');
    expect(ids).not.toContain('spare-offer');
  });
});

describe('touched-trucks evaluation = the whole case re-evaluated', () => {
  it('random cases, drivers, values and metrics', () => {
    let checked = 0;
    fc.assert(
      fc.property(
        fc.record({
          picks: fc.uniqueArray(fc.integer({ min: 0, max: raw.trucks.length - 1 }), { minLength: 2, maxLength: 6 }),
          swapOffers: fc.array(fc.boolean(), { minLength: 6, maxLength: 6 }),
          valuation: fc.constantFrom('expected' as const, 'median-path' as const),
          metric: fc.constantFrom('fleet-delta', 'fleet-best', 'truck-delta'),
          driverPicks: fc.array(fc.nat(), { minLength: 1, maxLength: 2 }),
          changes: fc.array(fc.double({ min: -0.3, max: 0.3, noNaN: true }), { minLength: 2, maxLength: 2 }),
        }),
        ({ picks, swapOffers, valuation, metric, driverPicks, changes }) => {
          const c = structuredClone(raw);
          c.trucks = picks.map((i) => c.trucks[i]);
          // mix the offers across trucks, so engines and offers are shared in new ways
          c.trucks.forEach((t, i) => {
            if (swapOffers[i % swapOffers.length]) t.repowerOfferId = c.repowerOffers[(c.repowerOffers.findIndex((o) => o.id === t.repowerOfferId) + 1) % c.repowerOffers.length].id;
          });
          c.assumptions.valuation = valuation;
          const v = validateCase(c);
          if (!v.ok) return; // an offer that does not fit the truck: not a case
          const kase = v.value;
          checked++;
          const m: Metric = metric === 'truck-delta' ? { kind: 'truck-delta', truckId: kase.trucks[0].id } : { kind: metric as 'fleet-delta' | 'fleet-best' };
          const drivers = listDrivers(kase);
          // an engine driver changes the renewal tables: pick those as often as the others
          const chosen: DriverRef[] = [...new Set(driverPicks.map((p) => p % drivers.length))].map((p) => drivers[p]);
          const overrides = chosen.map((d, i) => [d, clampDriver(d, getDriver(kase, d) * (1 + changes[i]))] as const);
          const fast = makeEvaluator(kase, m);
          const full = makeFullEvaluator(kase, m);
          expect(Object.is(fast.baseValue, full.baseValue)).toBe(true);
          for (const o of overrides) expect(Object.is(fast.at([o]), full.at([o])), `${o[0].key}@${o[0].target}`).toBe(true);
          expect(Object.is(fast.at(overrides), full.at(overrides))).toBe(true);
          // after the runs the evaluator is back at the base
          expect(Object.is(fast.at([]), full.baseValue)).toBe(true);
        },
      ),
      { numRuns: 40, seed: 20261203 },
    );
    expect(checked).toBeGreaterThan(30);
  }, 300_000);
});
