/**
 * Edge cases of the policy simulation (MODEL.md sections 2–8). Expected values
 * are worked from MODEL.md by hand in each test.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { bestPolicy, evaluateCase, evaluateCaseDetailed, evaluateTruck, medianFailureAge } from '@/lib/engine';
import type { CaseFileInput } from '@/lib/validation/case';

const base: CaseFileInput = JSON.parse(
  readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'),
);

function withCase(edit: (c: CaseFileInput) => void): CaseFileInput {
  const c = structuredClone(base);
  edit(c);
  return c;
}
function close(actual: number, expected: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(expected)));
}
const lostPerDay = (6000 / 365) * 850 * 2.5; // margin lost per day down, year-1 prices

describe('rate 0', () => {
  it('discounts nothing and gives EAC = −npv / N', () => {
    const c = withCase((x) => (x.assumptions.discountRate = 0));
    const r = evaluateCase(c).trucks[0].options.rebuild;
    const sum = r.cashFlows.reduce((s, v) => s + v, 0);
    close(r.npv, sum);
    close(r.eac, -sum / 3);
  });
});

describe('an engine already past its planned life', () => {
  const c = withCase((x) => {
    x.trucks[0].engineHours = 21000; // past the 20,000 h life
  });
  const { result, details } = evaluateCaseDetailed(c);
  const t = result.trucks[0];

  it('rebuild overhauls it now, in period 0, at year-1 prices with its days down', () => {
    const ev = details[0].policies.rebuild.events[0];
    expect([ev.kind, ev.period, ev.hourOfYear]).toEqual(['overhaul', 0, 0]);
    const b = t.options.rebuild.breakdown[0];
    close(b.overhauls, -900000);
    close(b.lostMargin, -9 * lostPerDay);
    close(b.taxEffect, 0.3 * (900000 + 9 * lostPerDay)); // expensed in period 0
    close(t.options.rebuild.cashFlows[0], -0.7 * (900000 + 9 * lostPerDay));
  });

  it('repower swaps it now (and nothing else); its depreciation starts in year 1', () => {
    const events = details[0].policies.repower.events;
    expect(events.map((e) => [e.kind, e.period])).toEqual([['repower', 0]]);
    const periods = details[0].policies.repower.periods;
    expect(periods[0].depreciation).toBe(0);
    close(periods[1].depreciation, 1540000 / 5);
    close(t.options.repower.breakdown[0].capital, -1540000);
  });

  it('keep has no event in period 0', () => {
    expect(details[0].policies.keep.events.every((e) => e.period > 0)).toBe(true);
    expect(t.options.keep.cashFlows[0]).toBe(0);
  });
});

describe('an event at the last hour of a year', () => {
  it('books in that year when it is not the last year', () => {
    // 14,000 h + 6,000 h = 20,000 h exactly at the end of year 1 of 2
    const c = withCase((x) => {
      x.trucks[0].engineHours = 14000;
      x.trucks[0].remainingLifeHours = 12000;
    });
    const d = evaluateCaseDetailed(c).details[0].policies.rebuild;
    expect(d.events.map((e) => [e.kind, e.period, e.hourOfYear])).toEqual([['overhaul', 1, 6000]]);
    // services in (14,000, 20,000] = 24, less the one the overhaul includes
    expect(d.periods[1].oilServices).toBe(23);
  });

  it('does not happen at the last hour of year N: residual credit 0, the service at 20,000 h counted', () => {
    const c = withCase((x) => {
      x.trucks[0].engineHours = 14000;
      x.trucks[0].remainingLifeHours = 6000;
    });
    const { result, details } = evaluateCaseDetailed(c);
    const d = details[0].policies.rebuild;
    expect(d.events).toEqual([]);
    expect(d.periods[1].oilServices).toBe(24);
    expect(d.residual.engineAge).toBe(20000);
    expect(result.trucks[0].options.rebuild.breakdown[1].residual).toBe(0);
    // repower: the swap due at that hour does not happen either
    expect(details[0].policies.repower.events).toEqual([]);
    expect(result.trucks[0].repowerVsRebuild.deltaNpv).toBe(0);
  });
});

describe('horizon', () => {
  it('is capped by horizonYears; the engine left is valued by the residual', () => {
    const c = withCase((x) => {
      x.trucks[0].remainingLifeHours = 60000;
      x.assumptions.horizonYears = 2;
    });
    const { result, details } = evaluateCaseDetailed(c);
    expect(result.trucks[0].horizonYears).toBe(2);
    const d = details[0].policies.rebuild;
    // overhauled at 20,000 h (3,500 h into year 1), then 2,500 + 6,000 = 8,500 h at the end of year 2
    expect(d.residual.engineAge).toBe(8500);
    close(d.residual.credit, 900000 * (1 - 8500 / 20000) * 1.025);
  });

  it('has a short last year when remaining life is not a whole number of years', () => {
    const c = withCase((x) => (x.trucks[0].remainingLifeHours = 13000));
    const d = evaluateCaseDetailed(c).details[0].policies.keep;
    expect(d.periods.map((p) => p.hours)).toEqual([0, 6000, 6000, 1000]);
  });
});

describe('mid-year timing', () => {
  it('discounts year y by (1+r)^−(y−0.5) but keeps EAC an end-of-year annuity', () => {
    const c = withCase((x) => (x.assumptions.timing = 'mid-year'));
    const { result, details } = evaluateCaseDetailed(c);
    const r = result.trucks[0].options.rebuild;
    const df = details[0].policies.rebuild.periods.map((p) => p.discountFactor);
    close(df[0], 1);
    close(df[1], 1 / Math.sqrt(1.08));
    close(df[3], 1.08 ** -2.5);
    close(r.npv, r.cashFlows.reduce((s, v, y) => s + v * 1.08 ** -(y === 0 ? 0 : y - 0.5), 0));
    close(r.eac, (-r.npv * 0.08 * 1.08 ** 3) / (1.08 ** 3 - 1));
  });
});

describe('capitalised rebuilds', () => {
  it('depreciate overhauls instead of expensing them; they stay in the overhauls category', () => {
    const c = withCase((x) => (x.assumptions.rebuildAccounting = 'capitalise'));
    const { result, details } = evaluateCaseDetailed(c);
    const d = details[0].policies.rebuild;
    const b1 = result.trucks[0].options.rebuild.breakdown[1];
    close(b1.overhauls, -900000);
    expect(b1.capital).toBe(0);
    expect(d.spends).toHaveLength(1);
    expect(d.spends[0].category).toBe('overhauls');
    // straight line 5 years from year 1: 180,000 in years 1–3, 360,000 written off in year 3
    close(d.periods[1].depreciation, 180000);
    close(d.periods[3].writeOff, 360000);
    // tax relief on year 1: running costs and lost margin only, plus the depreciation shield
    const p1 = d.periods[1];
    close(p1.deductibleCosts, -(b1.fuel + b1.lube + b1.lostMargin));
    close(b1.taxEffect, 0.3 * (p1.deductibleCosts + 180000));
    expect(result.trucks[0].rebuildVsKeep.profitabilityIndex).toBeNull(); // rebuild has no repower capital
  });
});

describe('declining balance with switch', () => {
  it('depreciates the repower 2/n of the basis left, switching to straight line', () => {
    const c = withCase((x) => {
      x.assumptions.depreciation = { method: 'declining-balance', years: 5, factor: 2 };
      x.trucks[0].remainingLifeHours = 36000; // N = 6 so the whole schedule fits
    });
    const d = evaluateCaseDetailed(c).details[0].policies.repower;
    const cap = 1540000;
    // 40 %, 24 %, 14.4 %, then the switch: 10.8 %, 10.8 %
    const expected = [0, 0.4 * cap, 0.24 * cap, 0.144 * cap, 0.108 * cap, 0.108 * cap, 0];
    d.periods.forEach((p, y) => close(p.depreciation, expected[y]));
    expect(d.periods[6].writeOff).toBe(0);
  });

  it('none: no depreciation and no write-off, the residual still taxed', () => {
    const c = withCase((x) => (x.assumptions.depreciation = { method: 'none' }));
    const { result, details } = evaluateCaseDetailed(c);
    const d = details[0].policies.repower;
    expect(d.periods.every((p) => p.depreciation === 0 && p.writeOff === 0)).toBe(true);
    const last = result.trucks[0].options.repower.breakdown[3];
    close(last.taxEffect, 0.3 * (d.periods[3].deductibleCosts - last.residual));
  });
});

describe('repower now', () => {
  it('spends the capital in period 0 and runs the new engine from year 1', () => {
    const c = withCase((x) => (x.repowerOffers[0].timing = 'now'));
    const { result, details } = evaluateCaseDetailed(c);
    const d = details[0].policies.repower;
    expect(d.events.map((e) => [e.kind, e.period])).toEqual([['repower', 0]]);
    const b0 = result.trucks[0].options.repower.breakdown[0];
    close(b0.capital, -1540000);
    close(b0.lostMargin, -2.5 * lostPerDay); // period-0 prices
    expect(d.segments.every((s) => s.engineId === 'new-2000')).toBe(true);
    // new engine from 0 to 18,000 h: services at every 2,000 h = 3 a year
    expect(d.periods.map((p) => p.oilServices)).toEqual([0, 3, 3, 3]);
    close(d.residual.credit, 950000 * (1 - 18000 / 25000) * 1.025 ** 2);
  });
});

describe('productivity gain', () => {
  it('earns the extra tonnes margin, taxed; the swap days at the old rate, later days at the new', () => {
    const c = withCase((x) => {
      x.repowerOffers[0].productivityGain = 0.02;
      x.trucks[0].remainingLifeHours = 42000; // 7 years, so the new engine has an event later
      x.engines[1].lifeHours = 20000; // new engine overhauled at 20,000 h, in year 4
    });
    const { result, details } = evaluateCaseDetailed(c);
    const r = result.trucks[0].options.repower;
    const d = details[0].policies.repower;
    // year 1: 2,500 h after the swap × 850 t/h × 2 % × 2.5 $/t
    close(r.breakdown[1].extraMargin, 2500 * 850 * 0.02 * 2.5);
    close(d.periods[1].tonnes, 3500 * 850 + 2500 * 867);
    close(d.events[0].lostMargin, 2.5 * lostPerDay); // old rate
    const overhaul = d.events.find((e) => e.kind === 'overhaul');
    expect(overhaul?.period).toBe(4);
    close(overhaul!.lostMargin, 8 * (6000 / 365) * 867 * 2.5 * 1.025 ** 3); // new rate
    // cost per hour leaves the after-tax extra margin out of the numerator
    const pvExtra = r.breakdown.reduce((s, b, y) => s + 0.7 * b.extraMargin * d.periods[y].discountFactor, 0);
    const pvHours = d.periods.reduce((s, p) => s + p.hours * p.discountFactor, 0);
    close(r.costPerHour, -(r.npv - pvExtra) / pvHours);
    expect(pvExtra).toBeGreaterThan(0);
  });
});

describe('measured fuel burn', () => {
  it('calibrates every engine on the truck by measured / modelled', () => {
    const c = withCase((x) => (x.trucks[0].fuelBurnLitresPerHour = 240));
    const d = evaluateTruck(c, 'T-01').detail;
    const k = 240 / ((1000 * 210) / 835);
    close(d.calibrationFactor, k);
    close(d.burnLitresPerHour['old-2000'], 240);
    close(d.burnLitresPerHour['new-2000'], (k * 1000 * 198) / 835);
  });
});

describe('carbon price', () => {
  it('costs CO2 tonnes at the escalated carbon price', () => {
    const c = withCase((x) => {
      x.assumptions.carbonPrice = 50;
      x.assumptions.carbonEscalation = 0.05;
    });
    const r = evaluateCase(c).trucks[0].options.keep;
    const litres = ((1000 * 210) / 835) * 6000;
    close(r.breakdown[2].carbon, -((litres * 2.697) / 1000) * 50 * 1.05);
  });
});

describe('failure-age provider (Monte Carlo hook)', () => {
  it('makes keep fail at the given age and rebuild fail only when that comes before planned life', () => {
    const seen: string[] = [];
    const failureAge = (ctx: { policy: string; lifeIndex: number; startAge: number; engineId: string }) => {
      seen.push(`${ctx.policy}:${ctx.engineId}:${ctx.lifeIndex}:${ctx.startAge}`);
      return ctx.lifeIndex === 0 ? 18000 : ctx.startAge + 100000;
    };
    const { details } = evaluateCaseDetailed(base, { failureAge });
    const keep = details[0].policies.keep.events;
    expect(keep.map((e) => [e.kind, e.period, e.hourOfYear])).toEqual([['failure', 1, 1500]]);
    const rebuild = details[0].policies.rebuild.events;
    expect(rebuild.map((e) => [e.kind, e.engineAge])).toEqual([['failure', 18000]]);
    const repower = details[0].policies.repower.events;
    expect(repower.map((e) => [e.kind, e.hourOfYear])).toEqual([['repower', 1500]]);
    expect(seen).toContain('keep:old-2000:0:16500');
    expect(seen).toContain('repower:new-2000:1:0');
  });

  it('defaults to the median path', () => {
    const median = (ctx: { startAge: number; engineId: string }) =>
      ctx.engineId === 'old-2000' ? medianFailureAge(ctx.startAge, 3.2, 24000) : medianFailureAge(ctx.startAge, 3.4, 30000);
    expect(evaluateCase(base, { failureAge: median })).toEqual(evaluateCase(base));
  });

  it('refuses a failure age not above the start age', () => {
    expect(() => evaluateCase(base, { failureAge: () => 100 })).toThrow(RangeError);
  });
});

describe('best', () => {
  it('ties within 1e-6 of the highest go to rebuild, then keep, then repower', () => {
    expect(bestPolicy({ keep: -10, rebuild: -10 + 5e-7, repower: -20 })).toBe('rebuild');
    expect(bestPolicy({ keep: -10, rebuild: -11, repower: -10 + 5e-7 })).toBe('keep');
    expect(bestPolicy({ keep: -10, rebuild: -11, repower: -9 })).toBe('repower');
  });
});
