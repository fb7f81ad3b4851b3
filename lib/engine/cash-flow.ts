/**
 * From a policy run to cash flows (MODEL.md sections 2, 4, 6 and 7): prices,
 * tax relief, depreciation shields and write-off, the residual credit, and the
 * per-period breakdown by category that adds up to each CF_y.
 */
import { co2Tonnes } from './fuel';
import { depreciationSchedule, placeSchedule } from './depreciation';
import type { PolicyRun } from './simulate';
import type { TruckSetup } from './setup';
import type { BreakdownEntry, DepreciatedSpend, PeriodDetail, PolicyDetail, ResidualDetail } from './types';

/**
 * Residual credit of the engine fitted at the end of year N: its overhaul cost
 * for the unused share of its life, at year-N prices:
 * overhaulCost · max(0, 1 − a_N / lifeHours) · index_N.
 *
 * @example residualCredit(900000, 14500, 20000, 1) // ≈ 247500
 */
export function residualCredit(overhaulCost: number, age: number, lifeHours: number, priceIndex: number): number {
  return overhaulCost * Math.max(0, 1 - age / lifeHours) * priceIndex;
}

/** A cost as cash: negative, and 0 rather than −0 when there is none. */
function negate(x: number): number {
  return x === 0 ? 0 : -x;
}

/** Cash flows of a policy run: tax, depreciation, residual and the breakdown by category. */
export interface PolicyCash {
  run: PolicyRun;
  n: number;
  /** CF_0..CF_N */
  cashFlows: number[];
  breakdown: BreakdownEntry[];
  co2Tonnes: number[];
  deductibleCosts: number[];
  depreciation: number[];
  /** basis written off in year N */
  writeOff: number;
  spends: DepreciatedSpend[];
  residual: ResidualDetail;
}

/** Tax, depreciation, residual and cash flow for a policy run. */
export function assembleCashFlows(setup: TruckSetup, run: PolicyRun): PolicyCash {
  const { a, n } = setup;
  const t = a.taxRate;
  const expense = a.rebuildAccounting === 'expense';

  // capital spends and their schedules: the repower always, overhauls and repairs when capitalised
  const depreciation = new Array<number>(n + 1).fill(0);
  let writeOff = 0;
  const spends: DepreciatedSpend[] = [];
  for (const ev of run.events) {
    let category: DepreciatedSpend['category'];
    if (ev.kind === 'repower') category = 'capital';
    else if (expense) continue;
    else category = ev.kind === 'overhaul' ? 'overhauls' : 'failures';
    if (ev.cost === 0) continue;
    const schedule = depreciationSchedule(ev.cost, a.depreciation); // empty under "none": no relief, no write-off
    const placed = placeSchedule(schedule, ev.period, n);
    for (let y = 1; y <= n; y++) depreciation[y] += placed.byPeriod[y];
    writeOff += placed.writeOff;
    spends.push({ period: ev.period, category, amount: ev.cost, schedule, byPeriod: placed.byPeriod, writeOff: placed.writeOff });
  }

  const endEngine = run.endEngine;
  const gN = setup.generalIndex[n];
  const residual: ResidualDetail = {
    engineId: endEngine.id,
    engineAge: run.endAge,
    lifeHours: endEngine.lifeHours,
    overhaulCost: endEngine.overhaulCost,
    priceIndex: gN,
    credit: residualCredit(endEngine.overhaulCost, run.endAge, endEngine.lifeHours, gN),
  };

  const cashFlows = new Array<number>(n + 1);
  const breakdown = new Array<BreakdownEntry>(n + 1);
  const co2 = new Array<number>(n + 1);
  const deductible = new Array<number>(n + 1);
  for (let y = 0; y <= n; y++) {
    const r = run.periods[y];
    co2[y] = co2Tonnes(r.fuelLitres, a.co2KgPerLitre);
    const fuel = r.fuelLitres * a.fuelPrice * setup.fuelIndex[y];
    const carbon = co2[y] * a.carbonPrice * setup.carbonIndex[y];
    deductible[y] = fuel + carbon + r.lube + r.lostMargin + (expense ? r.overhauls + r.failures : 0);
    const wo = y === n ? writeOff : 0;
    const credit = y === n ? residual.credit : 0;
    const taxEffect = t * (deductible[y] - r.extraMargin + depreciation[y] + wo - credit);
    const b: BreakdownEntry = {
      fuel: negate(fuel),
      carbon: negate(carbon),
      lube: negate(r.lube),
      overhauls: negate(r.overhauls),
      failures: negate(r.failures),
      capital: negate(r.capital),
      lostMargin: negate(r.lostMargin),
      extraMargin: r.extraMargin,
      taxEffect,
      residual: credit,
    };
    breakdown[y] = b;
    cashFlows[y] =
      b.fuel + b.carbon + b.lube + b.overhauls + b.failures + b.capital + b.lostMargin + b.extraMargin + b.taxEffect + b.residual;
  }
  return { run, n, cashFlows, breakdown, co2Tonnes: co2, deductibleCosts: deductible, depreciation, writeOff, spends, residual };
}

/** The per-period trace of a policy for the detailed output (workbook export, timelines). */
export function buildPolicyDetail(setup: TruckSetup, cash: PolicyCash): PolicyDetail {
  const { a, n } = setup;
  const periods: PeriodDetail[] = [];
  for (let y = 0; y <= n; y++) {
    const r = cash.run.periods[y];
    const gen = setup.generalIndex[y];
    periods.push({
      period: y,
      hours: r.hours,
      fuelLitres: r.fuelLitres,
      co2Tonnes: cash.co2Tonnes[y],
      tonnes: r.tonnes,
      extraTonnes: r.extraTonnes,
      oilServices: r.oilServices,
      topUpLitres: r.topUpLitres,
      downtimeDays: r.downtimeDays,
      discountFactor: setup.discountFactor[y],
      priceIndex: { fuel: setup.fuelIndex[y], carbon: setup.carbonIndex[y], general: gen },
      prices: {
        fuel: a.fuelPrice * setup.fuelIndex[y],
        carbon: a.carbonPrice * setup.carbonIndex[y],
        lube: a.lubePrice * gen,
        labour: a.labourRate * gen,
        marginPerTonne: a.marginPerTonne * gen,
      },
      deductibleCosts: cash.deductibleCosts[y],
      taxableGains: r.extraMargin,
      depreciation: cash.depreciation[y],
      writeOff: y === n ? cash.writeOff : 0,
      residualCredit: cash.breakdown[y].residual,
      breakdown: { ...cash.breakdown[y] },
      cashFlow: cash.cashFlows[y],
    });
  }
  return {
    policy: cash.run.policy,
    periods,
    segments: cash.run.segments,
    events: cash.run.events,
    spends: cash.spends,
    residual: cash.residual,
  };
}
