/**
 * scenarios/one-truck.json worked by hand, step by step, in plain arithmetic
 * (MODEL.md read directly; nothing here calls the engine's helpers). The
 * engine's output is then compared with each hand figure.
 *
 * The truck: 16,500 h on an engine planned for 20,000 h, 18,000 h of life
 * left at 6,000 h a year. Engine "old-2000" (210 g/kWh, oil every 250 h);
 * the repower offer fits "new-2000" (198 g/kWh, oil every 2,000 h).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { evaluateCaseDetailed } from '@/lib/engine';

const oneTruck = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/one-truck.json'), 'utf8'));
const { result, details } = evaluateCaseDetailed(oneTruck);
const truck = result.trucks[0];
const detail = details[0];

/** equal to 1e-6 relative (1e-6 absolute near zero), the contract's tolerance */
function close(actual: number, expected: number): void {
  expect(Math.abs(actual - expected)).toBeLessThanOrEqual(1e-6 * Math.max(1, Math.abs(expected)));
}

// ---- Step 1. Time grid: N = ceil(18,000 / 6,000) = 3 years of 6,000 h each.
const N = 3;
const H = [0, 6000, 6000, 6000];
// Discount factors at 8 %, end of year: 1, 1/1.08, 1/1.08², 1/1.08³.
const DF = [1, 1 / 1.08, 1 / 1.08 ** 2, 1 / 1.08 ** 3];
// Prices are year-1 prices: fuel grows 3 %, everything else 2.5 % (inflation).
const fuelPrice = [1.05, 1.05, 1.05 * 1.03, 1.05 * 1.03 ** 2];
const infl = [1, 1, 1.025, 1.025 ** 2];

// ---- Step 2. Fuel burn. Power demand P = 0.5 × 2,000 kW = 1,000 kW (the truck's duty, whatever engine).
// old: 1,000 kW × 210 g/kWh / (1,000 g/kg × 0.835 kg/L) = 251.497 L/h; new: × 198 → 237.126 L/h.
const burnOld = (1000 * 210) / (1000 * 0.835);
const burnNew = (1000 * 198) / (1000 * 0.835);

// ---- Step 3. Failure ages on the median path.
// fitted engine, survived to 16,500 h: 24,000 × ((16,500/24,000)^3.2 + ln 2)^(1/3.2) ≈ 23,959.7 h (after its 20,000 h life)
const failOld = 24000 * ((16500 / 24000) ** 3.2 + Math.log(2)) ** (1 / 3.2);
// a new or overhauled old-2000: 24,000 × (ln 2)^(1/3.2) ≈ 21,402.8 h; a new-2000: 30,000 × (ln 2)^(1/3.4) ≈ 26,983 h
const failOldNew = 24000 * Math.log(2) ** (1 / 3.2);

// ---- Step 4. One oil service at year-y prices: sump × lube + kit + labour hours × rate.
const serviceOld = (y: number) => (290 * 4.2 + 850 + 5 * 115) * infl[y]; // 2,643 in year 1
const serviceNew = (y: number) => (300 * 4.2 + 1000 + 6 * 115) * infl[y]; // 2,950 in year 1
// Days down cost lost margin: days × 6,000/365 h × 850 t/h × 2.5 $/t at year-y prices.
const lostMargin = (days: number, y: number) => days * (6000 / 365) * 850 * 2.5 * infl[y];

interface Year {
  litres: number;
  services: number;
  lube: number;
  overhauls: number;
  failures: number;
  capital: number;
  lost: number;
  depreciation: number;
  residual: number;
}
const T = 0.3;
function cashFlow(y: Year, yearIndex: number) {
  const fuel = y.litres * fuelPrice[yearIndex];
  const deductible = fuel + y.lube + y.lost + y.overhauls + y.failures; // expensed rebuilds
  const taxEffect = T * (deductible + y.depreciation - y.residual);
  return {
    fuel,
    taxEffect,
    cf: -fuel - y.lube - y.lost - y.overhauls - y.failures - y.capital + taxEffect + y.residual,
  };
}
const zeroYear: Year = { litres: 0, services: 0, lube: 0, overhauls: 0, failures: 0, capital: 0, lost: 0, depreciation: 0, residual: 0 };

// ---- Step 5. KEEP: no planned overhaul; the engine fails at 23,959.7 h, in year 2, and is repaired.
const keepFailHour = failOld - 22500; // 1,459.7 h into year 2
const keepEndAge = 6000 - keepFailHour + 6000; // age after year 3: 10,540.3 h since the repair
const keep: Year[] = [
  zeroYear,
  {
    // year 1: 16,500 → 22,500 h: services at 16,750 … 22,500 = 24; top-up 0.12 × 6,000 = 720 L
    ...zeroYear,
    litres: burnOld * 6000,
    services: 24,
    lube: 24 * serviceOld(1) + 0.12 * 6000 * 4.2 * infl[1],
  },
  {
    // year 2: 22,500 → 23,959.7 (5 services: 22,750 … 23,750), failure, then 0 → 4,540.3 (18 services: 250 … 4,500)
    ...zeroYear,
    litres: burnOld * 6000,
    services: 5 + 18,
    lube: 23 * serviceOld(2) + 0.12 * 6000 * 4.2 * infl[2],
    failures: 1350000 * infl[2],
    lost: lostMargin(28, 2),
  },
  {
    // year 3: 4,540.3 → 10,540.3: multiples of 250 from 4,750 to 10,500 = 42 − 18 = 24
    ...zeroYear,
    litres: burnOld * 6000,
    services: 24,
    lube: 24 * serviceOld(3) + 0.12 * 6000 * 4.2 * infl[3],
    // residual: 900,000 × (1 − 10,540.3/20,000) at year-3 prices, taxed at 30 %
    residual: 900000 * (1 - keepEndAge / 20000) * infl[3],
  },
];

// ---- Step 6. REBUILD: planned overhaul at 20,000 h, 3,500 h into year 1; the rebuilt engine then runs 14,500 h.
const rebuild: Year[] = [
  zeroYear,
  {
    // 16,500 → 20,000: 14 multiples of 250, but the one at 20,000 is the overhaul's own oil change → 13;
    // then 0 → 2,500 h: 10 services. Overhaul $900,000 and 9 days down, at year-1 prices.
    ...zeroYear,
    litres: burnOld * 6000,
    services: 13 + 10,
    lube: 23 * serviceOld(1) + 0.12 * 6000 * 4.2,
    overhauls: 900000,
    lost: lostMargin(9, 1),
  },
  // years 2 and 3: 2,500 → 8,500 → 14,500 h, 24 services each; the next failure (21,402.8 h) is beyond the horizon
  { ...zeroYear, litres: burnOld * 6000, services: 24, lube: 24 * serviceOld(2) + 0.12 * 6000 * 4.2 * infl[2] },
  {
    ...zeroYear,
    litres: burnOld * 6000,
    services: 24,
    lube: 24 * serviceOld(3) + 0.12 * 6000 * 4.2 * infl[3],
    // residual: 900,000 × (1 − 14,500/20,000) = 247,500 at year-1 prices → × 1.025²
    residual: 900000 * (1 - 14500 / 20000) * infl[3],
  },
];

// ---- Step 7. REPOWER at the overhaul: at 20,000 h (3,500 h into year 1) the new module goes in instead.
// Capital = 1,500,000 + 140,000 − 100,000 = 1,540,000; straight line over 5 years = 308,000 a year;
// the horizon ends after year 3, so 2 × 308,000 = 616,000 is written off in year 3.
const capital = 1500000 + 140000 - 100000;
const repower: Year[] = [
  zeroYear,
  {
    // old engine 3,500 h (13 services, the 14th is part of the swap), new engine 2,500 h (1 service at 2,000 h)
    ...zeroYear,
    litres: burnOld * 3500 + burnNew * 2500,
    services: 13 + 1,
    lube: 13 * serviceOld(1) + 1 * serviceNew(1) + (0.12 * 3500 + 0.08 * 2500) * 4.2,
    capital,
    lost: lostMargin(2.5, 1),
    depreciation: capital / 5,
  },
  {
    // new engine 2,500 → 8,500 h: services at 4,000, 6,000, 8,000
    ...zeroYear,
    litres: burnNew * 6000,
    services: 3,
    lube: 3 * serviceNew(2) + 0.08 * 6000 * 4.2 * infl[2],
    depreciation: capital / 5,
  },
  {
    // 8,500 → 14,500 h: services at 10,000, 12,000, 14,000; residual 950,000 × (1 − 14,500/25,000)
    ...zeroYear,
    litres: burnNew * 6000,
    services: 3,
    lube: 3 * serviceNew(3) + 0.08 * 6000 * 4.2 * infl[3],
    depreciation: capital / 5 + (2 * capital) / 5,
    residual: 950000 * (1 - 14500 / 25000) * infl[3],
  },
];

const byHand = { keep, rebuild, repower };
const handCf = {
  keep: keep.map(cashFlow),
  rebuild: rebuild.map(cashFlow),
  repower: repower.map(cashFlow),
};
const handNpv = (p: keyof typeof handCf) => handCf[p].reduce((s, c, y) => s + c.cf * DF[y], 0);

describe('one truck, worked by hand', () => {
  it('has a 3-year horizon of 6,000 h a year, discounted at 8 % end of year', () => {
    expect(truck.horizonYears).toBe(N);
    const periods = detail.policies.keep.periods;
    periods.forEach((p, y) => {
      expect(p.hours).toBe(H[y]);
      close(p.discountFactor, DF[y]);
      close(p.priceIndex.general, infl[y]);
    });
  });

  it('burns 251.497 L/h on the old engine and 237.126 L/h on the new one', () => {
    close(detail.burnLitresPerHour['old-2000'], burnOld);
    close(detail.burnLitresPerHour['new-2000'], burnNew);
    expect(detail.calibrationFactor).toBe(1);
  });

  it('places the events where the hand places them', () => {
    const keepEvents = detail.policies.keep.events;
    expect(keepEvents.map((e) => [e.kind, e.period])).toEqual([['failure', 2]]);
    close(keepEvents[0].hourOfYear, keepFailHour);
    close(keepEvents[0].engineAge, failOld);
    expect(detail.policies.rebuild.events.map((e) => [e.kind, e.period, e.hourOfYear])).toEqual([['overhaul', 1, 3500]]);
    const rp = detail.policies.repower.events;
    expect(rp.map((e) => [e.kind, e.period, e.hourOfYear, e.engineId, e.newEngineId])).toEqual([
      ['repower', 1, 3500, 'old-2000', 'new-2000'],
    ]);
    expect(failOldNew).toBeGreaterThan(14500); // the rebuilt engine does not fail within the horizon
  });

  for (const policy of ['keep', 'rebuild', 'repower'] as const) {
    it(`${policy}: litres, services, lube, events' money, depreciation and residual match by year`, () => {
      const periods = detail.policies[policy].periods;
      byHand[policy].forEach((year, y) => {
        const p = periods[y];
        close(p.fuelLitres, year.litres);
        expect(p.oilServices).toBe(year.services);
        close(-p.breakdown.lube, year.lube);
        close(-p.breakdown.overhauls, year.overhauls);
        close(-p.breakdown.failures, year.failures);
        close(-p.breakdown.capital, year.capital);
        close(-p.breakdown.lostMargin, year.lost);
        close(p.depreciation + p.writeOff, year.depreciation);
        close(p.breakdown.residual, year.residual);
        close(p.co2Tonnes, (year.litres * 2.697) / 1000);
      });
    });

    it(`${policy}: tax effect, cash flows and npv match`, () => {
      const r = truck.options[policy];
      handCf[policy].forEach((c, y) => {
        close(-r.breakdown[y].fuel, c.fuel);
        close(r.breakdown[y].taxEffect, c.taxEffect);
        close(r.cashFlows[y], c.cf);
      });
      close(r.npv, handNpv(policy));
      // EAC: −npv × 0.08 × 1.08³ / (1.08³ − 1)
      close(r.eac, (-handNpv(policy) * 0.08 * 1.08 ** 3) / (1.08 ** 3 - 1));
      // cost per hour: −npv / Σ H·DF (no extra margin here); per tonne: / Σ 850·H·DF
      const pvHours = H.reduce((s, h, y) => s + h * DF[y], 0);
      close(r.costPerHour, -handNpv(policy) / pvHours);
      close(r.costPerTonne, -handNpv(policy) / (850 * pvHours));
      close(r.hours, 18000);
      close(r.fuelLitres, byHand[policy].reduce((s, y) => s + y.litres, 0));
    });
  }

  it('compares repower with rebuild on ΔCF', () => {
    const delta = [0, 1, 2, 3].map((y) => handCf.repower[y].cf - handCf.rebuild[y].cf);
    const cmp = truck.repowerVsRebuild;
    close(cmp.deltaNpv, delta.reduce((s, d, y) => s + d * DF[y], 0));
    // ΔCF: year 1 negative (the module), years 2 and 3 positive → one sign change
    expect(delta[1]).toBeLessThan(0);
    expect(delta[2]).toBeGreaterThan(0);
    expect(delta[3]).toBeGreaterThan(0);
    expect(cmp.irrSignChanges).toBe(1);
    // payback from year 1: year 2 leaves cum < 0, year 3 brings it to ≥ 0 → (3 − 1 − 1) + (−cum₂)/Δ₃
    const cum2 = delta[1] + delta[2];
    expect(cum2).toBeLessThan(0);
    close(cmp.paybackYears as number, 1 + -cum2 / delta[3]);
    // irr: Σ Δ_y/(1+i)^y = 0 at the reported rate
    const i = cmp.irr as number;
    expect(Math.abs(delta.reduce((s, d, y) => s + d / (1 + i) ** y, 0))).toBeLessThan(1e-6);
    // profitability index: 1 + ΔNPV / PV of the repower's capital (1,540,000 in year 1)
    close(cmp.profitabilityIndex as number, 1 + cmp.deltaNpv / (capital / 1.08));
  });

  it('picks the policy with the highest npv', () => {
    const npvs = { keep: handNpv('keep'), rebuild: handNpv('rebuild'), repower: handNpv('repower') };
    const best = (Object.keys(npvs) as (keyof typeof npvs)[]).reduce((a, b) => (npvs[b] > npvs[a] ? b : a));
    expect(truck.best).toBe(best);
    close(result.fleet.npv.best, npvs[best]);
    close(result.fleet.capital.repower, capital);
  });
});
