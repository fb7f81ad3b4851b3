/**
 * Issue 12: the engine's own guards, below the schema. An engine with a life
 * of a few hours (weibullShape 0.01) used to make one evaluation allocate
 * until the heap limit; a tax life of 1e9 years allocated a schedule of that
 * length ("invalid table size"). Called with a case that skips validation,
 * the engine now stops at MAX_EVENTS_PER_RUN with an EventLimitError naming
 * the truck, and places only the depreciation that falls within the horizon.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { addSpendInto, EventLimitError, evaluateCase, evaluateCaseDetailed, evaluateNpvs, MAX_EVENTS_PER_RUN } from '@/lib/engine';
import { errorResponse } from '@/lib/http';
import type { CaseFileInput } from '@/lib/validation/case';

const oneTruck: CaseFileInput = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));

/** The one-truck case with an engine that fails after ~1e-12 h (shape 0.01), never validated. */
function runaway(): CaseFileInput {
  const c = structuredClone(oneTruck);
  for (const e of c.engines) e.weibullShape = 0.01;
  return c;
}

describe('engine: events per run are capped', () => {
  it('evaluateCase (trusted) throws EventLimitError naming the truck instead of running away', () => {
    let caught: unknown;
    try {
      evaluateCase(runaway(), { trusted: true });
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(EventLimitError);
    expect((caught as EventLimitError).truckId).toBe('T-01');
    expect((caught as Error).message).toMatch(/^truck T-01: the rebuild policy would book more than 10,000 engine events/); // keep's first failure lies beyond the horizon
  });

  it('the NPV-only path and the detailed path stop the same way', () => {
    expect(() => evaluateNpvs(runaway(), { trusted: true })).toThrow(EventLimitError);
    expect(() => evaluateCaseDetailed(runaway(), { trusted: true })).toThrow(EventLimitError);
  });

  it('a failure-age provider that fails every engine at once is stopped too, on a valid case', () => {
    const c = structuredClone(oneTruck);
    expect(() => evaluateCase(c, { failureAge: (ctx) => ctx.startAge + 1e-3 })).toThrow(EventLimitError);
    // 1,000 h lives over the 18,000 h left: 18 failures, well under the cap
    const r = evaluateCaseDetailed(c, { failureAge: (ctx) => ctx.startAge + 1000 });
    expect(r.details[0].policies.keep.events.length).toBeLessThan(MAX_EVENTS_PER_RUN);
  });

  it('the API answers the error as 422 with the message', async () => {
    const res = errorResponse(new EventLimitError('T-01', 'keep'));
    expect(res.status).toBe(422);
    const body = await res.json();
    expect(body.problems[0].path).toBe('truck T-01');
    expect(body.problems[0].message).toMatch(/more than 10,000 engine events/);
  });
});

describe('engine: no depreciation schedule longer than the horizon', () => {
  it('a 1e9-year straight line evaluates (trusted) and writes off the rest in year N', () => {
    const c = structuredClone(oneTruck);
    c.assumptions.depreciation = { method: 'straight-line', years: 1e9 };
    c.assumptions.taxRate = 0.3;
    const d = evaluateCaseDetailed(c, { trusted: true });
    const n = d.details[0].horizonYears;
    for (const spend of d.details[0].policies.repower.spends) {
      expect(spend.schedule.length).toBeLessThanOrEqual(n);
      const placed = spend.byPeriod.reduce((s, x) => s + x, 0);
      expect(placed + spend.writeOff).toBeCloseTo(spend.amount, 3);
    }
    expect(Number.isFinite(d.result.trucks[0].options.repower.npv)).toBe(true);
  });

  it('addSpendInto touches only periods 0..N and returns the basis left', () => {
    const byPeriod = new Array<number>(4).fill(0);
    // 1e9 years of 1 each from a spend of 1e9: years 1..3 get 1, the write-off is 1e9 − 3
    expect(addSpendInto(1e9, { method: 'straight-line', years: 1e9 }, 0, 3, byPeriod)).toBe(1e9 - 3);
    expect(byPeriod).toEqual([0, 1, 1, 1]);
    const db = new Array<number>(3).fill(0);
    // declining balance 1000 over 5 at 2: 400, 240 placed in years 1–2, 360 written off (MODEL.md section 6)
    expect(addSpendInto(1000, { method: 'declining-balance', years: 5, factor: 2 }, 1, 2, db)).toBeCloseTo(360, 9);
    expect(db[1]).toBeCloseTo(400, 9);
    expect(db[2]).toBeCloseTo(240, 9);
    // MACRS 7-year from period 0 over 2 years: 14.29 % and 24.49 % placed, the other 61.22 % written off (IRS Pub. 946, A-1)
    const m = new Array<number>(3).fill(0);
    expect(addSpendInto(100000, { method: 'macrs', years: 7 }, 0, 2, m)).toBeCloseTo(61220, 6);
    expect(m).toEqual([0, expect.closeTo(14290, 6), expect.closeTo(24490, 6)]);
  });
});
