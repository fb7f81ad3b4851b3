/**
 * From a policy run to cash flows (MODEL.md sections 2, 4, 6 and 7): prices,
 * tax relief, depreciation shields and write-off, the residual credit, and the
 * per-period breakdown by category that adds up to each CF_y.
 */
import { co2Tonnes } from './fuel';
import { addSpendInto, depreciationSchedule, isDepreciatedSpend } from './depreciation';
import type { PolicyRun } from './simulate';
import type { TruckSetup } from './setup';
import { EVENT_CODE, type PeriodQuantities, type BreakdownEntry, type DepreciatedSpend, type PeriodDetail, type PolicyDetail, type ResidualDetail } from './types';

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

/** A cost as cash: negative, and 0 rather than −0 when there is none (0 − x is exactly that, without a branch). */
function negate(x: number): number {
  return 0 - x;
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
  residual: ResidualDetail;
}

const CATEGORY_BY_CODE: DepreciatedSpend['category'][] = [];
CATEGORY_BY_CODE[EVENT_CODE.overhaul] = 'overhauls';
CATEGORY_BY_CODE[EVENT_CODE.failure] = 'failures';
CATEGORY_BY_CODE[EVENT_CODE.repower] = 'capital';

/** Whether an event's spend (kind code, cost) is depreciated (`isDepreciatedSpend`). */
function isDepreciated(code: number, cost: number, expense: boolean): boolean {
  return isDepreciatedSpend(code === EVENT_CODE.repower, cost, expense);
}

/**
 * The record of each depreciated spend of a run (the repower always, overhauls
 * and repairs when capitalised): its schedule and where it falls. The detailed
 * output only; the totals by year are the run's own (`run.depreciation`).
 */
export function depreciatedSpends(setup: TruckSetup, run: PolicyRun): DepreciatedSpend[] {
  const { a, n } = setup;
  const expense = a.rebuildAccounting === 'expense';
  const spends: DepreciatedSpend[] = [];
  const log = run.log;
  for (let i = 0; i < log.count; i++) {
    const cost = log.cost[i];
    const period = log.period[i];
    if (!isDepreciated(log.kind[i], cost, expense)) continue;
    // only the entries within the horizon (empty under "none": no relief, no write-off); the rest is the write-off
    const schedule = depreciationSchedule(cost, a.depreciation, n - Math.max(period, 1) + 1);
    const byPeriod = new Array<number>(n + 1).fill(0);
    const writeOff = addSpendInto(cost, a.depreciation, period, n, byPeriod);
    spends.push({ period, category: CATEGORY_BY_CODE[log.kind[i]], amount: cost, schedule, byPeriod, writeOff });
  }
  return spends;
}

/** Residual credit of the engine fitted at the end of a run (MODEL.md section 7). */
export function residualOf(setup: TruckSetup, run: PolicyRun): ResidualDetail {
  const endEngine = run.endEngine;
  const gN = setup.generalIndex[setup.n];
  return {
    engineId: endEngine.id,
    engineAge: run.endAge,
    lifeHours: endEngine.lifeHours,
    overhaulCost: endEngine.overhaulCost,
    priceIndex: gN,
    // the expected valuation's credit, over every engine that may be fitted (endAge: the age giving it on endEngine)
    credit: run.residualCredit ?? residualCredit(endEngine.overhaulCost, run.endAge, endEngine.lifeHours, gN),
  };
}

/** One period's cash: the breakdown by category, CF_y (their sum), CO2 and deductible costs.
 * The full and the NPV-only paths both compute it with `periodCashFlow`, so their cash flows are identical. */
export interface PeriodCash {
  breakdown: BreakdownEntry;
  cashFlow: number;
  co2: number;
  deductible: number;
}

/** The amounts of one period before signs: costs positive, as `periodCashFlow` fills them. */
interface PeriodFigures {
  fuel: number;
  carbon: number;
  co2: number;
  deductible: number;
  taxEffect: number;
}

/**
 * CF_y: the signed categories added in breakdown order (the order fixes the
 * rounding); with `out`, the amounts behind it too (the full path's breakdown).
 */
function periodCashFlow(
  setup: TruckSetup,
  run: PolicyRun,
  y: number,
  depreciation: number,
  writeOff: number,
  credit: number,
  out: PeriodFigures | null,
): number {
  const a = setup.a;
  const t = a.taxRate;
  const expense = a.rebuildAccounting === 'expense';
  const r = run.periods[y];
  const co2 = co2Tonnes(r.fuelLitres, a.co2KgPerLitre);
  const fuel = r.fuelLitres * a.fuelPrice * setup.fuelIndex[y];
  const carbon = co2 * a.carbonPrice * setup.carbonIndex[y];
  const deductible = fuel + carbon + r.lube + r.lostMargin + (expense ? r.overhauls + r.failures : 0);
  const taxEffect = t * (deductible - r.extraMargin + depreciation + writeOff - credit);
  if (out) {
    out.fuel = fuel;
    out.carbon = carbon;
    out.co2 = co2;
    out.deductible = deductible;
    out.taxEffect = taxEffect;
  }
  return (
    negate(fuel) + negate(carbon) + negate(r.lube) + negate(r.overhauls) + negate(r.failures) + negate(r.capital) +
    negate(r.lostMargin) + r.extraMargin + taxEffect + credit
  );
}

export function periodCash(setup: TruckSetup, run: PolicyRun, y: number, depreciation: number, writeOff: number, credit: number): PeriodCash {
  const f: PeriodFigures = { fuel: 0, carbon: 0, co2: 0, deductible: 0, taxEffect: 0 };
  const cashFlow = periodCashFlow(setup, run, y, depreciation, writeOff, credit, f);
  const r = run.periods[y];
  const b: BreakdownEntry = {
    fuel: negate(f.fuel),
    carbon: negate(f.carbon),
    lube: negate(r.lube),
    overhauls: negate(r.overhauls),
    failures: negate(r.failures),
    capital: negate(r.capital),
    lostMargin: negate(r.lostMargin),
    extraMargin: r.extraMargin,
    taxEffect: f.taxEffect,
    residual: credit,
  };
  return { breakdown: b, cashFlow, co2: f.co2, deductible: f.deductible };
}

/** Tax, depreciation, residual and cash flow for a policy run. */
export function assembleCashFlows(setup: TruckSetup, run: PolicyRun): PolicyCash {
  const n = setup.n;
  const depreciation = run.depreciated ? run.depreciation.slice(0, n + 1) : new Array<number>(n + 1).fill(0);
  const writeOff = run.discounted.writeOff;
  const residual = residualOf(setup, run);
  const cashFlows = new Array<number>(n + 1);
  const breakdown = new Array<BreakdownEntry>(n + 1);
  const co2 = new Array<number>(n + 1);
  const deductible = new Array<number>(n + 1);
  for (let y = 0; y <= n; y++) {
    const pc = periodCash(setup, run, y, depreciation[y], y === n ? writeOff : 0, y === n ? residual.credit : 0);
    co2[y] = pc.co2;
    deductible[y] = pc.deductible;
    breakdown[y] = pc.breakdown;
    cashFlows[y] = pc.cashFlow;
  }
  return { run, n, cashFlows, breakdown, co2Tonnes: co2, deductibleCosts: deductible, depreciation, writeOff, residual };
}

/** Present values, at the case's discount rate, of what a policy run spends and earns, by kind (all positive). */
export interface DiscountedTotals {
  /** Σ DF_y · litres_y · (fuel + carbon price of a litre in year y) */
  energy: number;
  /** Σ DF_y · lube_y, lostMargin_y, overhauls_y, failures_y, capital_y, extraMargin_y */
  lube: number;
  lostMargin: number;
  overhauls: number;
  failures: number;
  capital: number;
  extraMargin: number;
  /** Σ DF_y · depreciation_y, the write-off excluded */
  depreciation: number;
  /** basis written off in year N (undiscounted) */
  writeOff: number;
}

/**
 * The npv of a run from its discounted totals: Σ CF_y·DF_y regrouped by kind,
 * which the simulation can sum as it goes (no second pass over the periods).
 * From CF_y = −fuel − carbon − lube − overhauls − failures − capital − lost
 * + extra + t·(fuel + carbon + lube + lost + [expense](overhauls + failures)
 * − extra + dep + [y = N](writeOff − credit)) + [y = N]·credit:
 *
 * npv = −(1 − t)·(energy + lube + lost) − (1 − t·[expense])·(overhauls + failures) − capital
 *       + (1 − t)·extra + t·Σ DF·dep + DF_N·(t·writeOff + (1 − t)·credit)
 *
 * Equal to Σ CF_y·DF_y of the cash-flow table up to rounding (a property test
 * holds them within 1e-9, relative, over random cases); the engine reports
 * this figure as every policy's npv, on the full and the lean path alike.
 *
 * @example npvFromTotals({ energy: 100, lube: 0, lostMargin: 0, overhauls: 0, failures: 0, capital: 0, extraMargin: 0, depreciation: 0, writeOff: 0 }, 0.3, true, 1, 0) // = −70
 */
export function npvFromTotals(d: DiscountedTotals, taxRate: number, expense: boolean, lastDiscountFactor: number, credit: number): number {
  const t = taxRate;
  return (
    -(1 - t) * (d.energy + d.lube + d.lostMargin) -
    (1 - (expense ? t : 0)) * (d.overhauls + d.failures) -
    d.capital +
    (1 - t) * d.extraMargin +
    t * d.depreciation +
    lastDiscountFactor * (t * d.writeOff + (1 - t) * credit)
  );
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
    valuation: cash.run.quantities ? 'expected' : 'path',
    quantities: cash.run.quantities ?? tracedQuantities(setup, cash.run),
    periods,
    segments: cash.run.segments,
    events: cash.run.events,
    spends: depreciatedSpends(setup, cash.run),
    residual: cash.residual,
  };
}

/** The quantities of a traced path: services by engine from the segments, counts and lost tonnes from the events. */
function tracedQuantities(setup: TruckSetup, run: PolicyRun): PeriodQuantities[] {
  const rows: PeriodQuantities[] = [];
  for (let y = 0; y <= setup.n; y++) {
    rows.push({ servicesStart: 0, servicesNew: 0, overhauls: 0, repairs: 0, plannedRepowers: 0, failedRepowers: 0, lostTonnes: 0 });
  }
  for (const s of run.segments) {
    if (s.engineId === setup.start.id) rows[s.period].servicesStart += s.oilServices;
    else rows[s.period].servicesNew += s.oilServices;
  }
  for (const e of run.events) {
    const q = rows[e.period];
    q.lostTonnes += ((e.downtimeDays * setup.truck.annualHours) / 365) * e.downtimeTonnesPerHour;
    if (e.kind === 'overhaul') q.overhauls += 1;
    else if (e.kind === 'failure') q.repairs += 1;
    else if (e.unplanned) q.failedRepowers += 1;
    else q.plannedRepowers += 1;
  }
  return rows;
}
