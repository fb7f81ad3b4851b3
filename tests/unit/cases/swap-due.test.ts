/**
 * When a chosen repower is due (lib/cases/swap-due.ts, plannedEventMonth in
 * lib/plan/schedule.ts): the month the engine reaches its planned life,
 * booked in periods as MODEL.md section 3 books events (the year's last hour
 * included, nothing at the horizon's last hour), for both valuations.
 * Expected months are worked by hand beside each check.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCase, evaluateCaseDetailed } from '@/lib/engine';
import { plannedEventMonth } from '@/lib/plan';
import { repowerDue, type DueInput } from '@/lib/cases/swap-due';
import { timelines } from '@/lib/cases/summary';
import type { CaseFileInput } from '@/lib/validation/case';

const demo: CaseFileInput = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/aldervane-north-pit.json'), 'utf8'));

describe('plannedEventMonth', () => {
  it('places the event in the year whose hours hold it, at the month of its hour in that year', () => {
    // 20,000 h life, 12,600 h run: 7,400 h to go at 6,050 h a year = year 2, 1,350 h in: month 12 + ⌊12·1350/6050⌋ = 14
    expect(plannedEventMonth(7_400, 6_050, 60_000)).toEqual({ period: 2, month: 14 });
    // 900 h in year 1: ⌊12·900/6050⌋ = month 1
    expect(plannedEventMonth(900, 6_050, 60_000)).toEqual({ period: 1, month: 1 });
    // exactly at the end of year 1: booked in year 1 (its last hour included), its last month
    expect(plannedEventMonth(6_000, 6_000, 60_000)).toEqual({ period: 1, month: 11 });
    // a hair past it: year 2, month 12
    expect(plannedEventMonth(6_000.01, 6_000, 60_000)).toEqual({ period: 2, month: 12 });
  });

  it('is now for an engine at or past its life and null at or beyond the horizon\'s last hour', () => {
    expect(plannedEventMonth(0, 6_000, 60_000)).toEqual({ period: 0, month: 0 });
    expect(plannedEventMonth(-1_500, 6_000, 60_000)).toEqual({ period: 0, month: 0 });
    expect(plannedEventMonth(18_000, 6_000, 18_000)).toBeNull(); // due at the very end: it does not happen
    expect(plannedEventMonth(25_000, 6_000, 18_000)).toBeNull();
    // a short last year: 17,000 h of remaining life at 6,000 h a year; due at 16,500 h = year 3, 4,500 h in: month 24 + 9
    expect(plannedEventMonth(16_500, 6_000, 17_000)).toEqual({ period: 3, month: 33 });
  });
});

describe('repowerDue', () => {
  const base: DueInput = {
    valuation: 'expected', engineHours: 12_600, annualHours: 6_050, remainingLifeHours: 60_000, lifeHours: 20_000,
    timing: 'at-overhaul', horizonYears: 10, fallbackPeriod: 1,
  };

  it('expected valuation: the planned repower (planned life, or now), not the first year with expected spend', () => {
    expect(repowerDue(base)).toEqual({ period: 2, month: 14 });
    expect(repowerDue({ ...base, timing: 'now' })).toEqual({ period: 0, month: 0 });
    expect(repowerDue({ ...base, engineHours: 21_000 })).toEqual({ period: 0, month: 0 });
    // planned life beyond a 1-year cap: the swap comes only with a failure, from the start of the first year with spend
    expect(repowerDue({ ...base, horizonYears: 1 })).toEqual({ period: 1, month: 0 });
  });

  it('median path: the traced repower, where its capital is booked (a failure may bring it forward)', () => {
    expect(repowerDue({ ...base, valuation: 'median-path', traced: { period: 1, month: 7 } })).toEqual({ period: 1, month: 7 });
  });

  it('on the demo, the planned month equals the median path\'s traced repower wherever that repower is the planned one', () => {
    const c = structuredClone(demo);
    c.assumptions.valuation = 'median-path';
    const { result, details } = evaluateCaseDetailed(c);
    let compared = 0;
    details.forEach((d, i) => {
      const input = c.trucks[i];
      const engine = c.engines.find((e) => e.id === input.engineId)!;
      const traced = timelines(d, input.annualHours).repower.find((e) => e.kind === 'repower');
      const raw = d.policies.repower.events.find((e) => e.kind === 'repower');
      if (!traced || !raw || Math.abs(raw.engineAge - engine.lifeHours) > 1e-6) return;
      const planned = repowerDue({
        valuation: 'expected', engineHours: input.engineHours, annualHours: input.annualHours, remainingLifeHours: input.remainingLifeHours,
        lifeHours: engine.lifeHours, timing: 'at-overhaul', horizonYears: result.trucks[i].horizonYears, fallbackPeriod: null,
      });
      expect(planned, input.id).toEqual({ period: traced.period, month: traced.month });
      compared++;
    });
    expect(compared).toBeGreaterThan(10);
  });

  it('on the demo under the expected valuation, the due period holds the planned swap\'s expected capital', () => {
    // capital booked in the due period ≥ P(the engine reaches its life) · (module + install − core credit) · (1 + inflation)^(p − 1)
    // (MODEL.md sections 2, 3 and 11; the failed swaps of that year add to it)
    const result = evaluateCase(demo);
    const inflation = demo.assumptions.inflation ?? 0;
    result.trucks.forEach((t, i) => {
      const input = demo.trucks[i];
      const e = demo.engines.find((x) => x.id === input.engineId)!;
      const o = demo.repowerOffers.find((x) => x.id === input.repowerOfferId)!;
      const due = repowerDue({
        valuation: 'expected', engineHours: input.engineHours, annualHours: input.annualHours, remainingLifeHours: input.remainingLifeHours,
        lifeHours: e.lifeHours, timing: o.timing ?? 'at-overhaul', horizonYears: t.horizonYears, fallbackPeriod: null,
      });
      if (!due) return;
      const H = (x: number) => Math.pow(x / e.weibullScaleHours, e.weibullShape);
      const reach = input.engineHours >= e.lifeHours ? 1 : Math.exp(H(input.engineHours) - H(e.lifeHours));
      const planned = reach * (o.modulePrice + (o.installCost ?? 0) - (o.coreCredit ?? 0)) * Math.pow(1 + inflation, Math.max(0, due.period - 1));
      expect(-t.options.repower.breakdown[due.period].capital, input.id).toBeGreaterThanOrEqual(planned * (1 - 1e-6));
      // and no earlier period holds more than the failures before the planned swap can cost
      for (let y = 0; y < due.period; y++) expect(-t.options.repower.breakdown[y].capital).toBeLessThan(planned);
    });
  });
});
