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
 * @example residualCredit(900000, 14500, 20000, 1) // = 247500
 */
export function residualCredit(overhaulCost: number, age: number, lifeHours: number, priceIndex: number): number {
  return overhaulCost * Math.max(0, 1 - age / lifeHours) * priceIndex;
}

/** Tax, depreciation, residual and cash flow for a policy run. */
export function assembleCashFlows(setup: TruckSetup, run: PolicyRun): PolicyDetail {
  const { a, n } = setup;
  const t = a.taxRate;
  const expense = a.rebuildAccounting === 'expense';

  // capital spends and their schedules: the repower always, overhauls and repairs when capitalised
  const depreciation = new Float64Array(n + 1);
  let writeOff = 0;
  const spends: DepreciatedSpend[] = [];
  const addSpend = (period: number, category: DepreciatedSpend['category'], amount: number): void => {
    if (amount === 0 || a.depreciation.method === 'none') {
      if (amount !== 0) spends.push({ period, category, amount, schedule: [], byPeriod: new Array(n + 1).fill(0), writeOff: 0 });
      return;
    }
    const schedule = depreciationSchedule(amount, a.depreciation);
    const placed = placeSchedule(schedule, period, n);
    for (let y = 1; y <= n; y++) depreciation[y] += placed.byPeriod[y];
    writeOff += placed.writeOff;
    spends.push({ period, category, amount, schedule, byPeriod: placed.byPeriod, writeOff: placed.writeOff });
  };
  for (const ev of run.events) {
    if (ev.kind === 'repower') addSpend(ev.period, 'capital', ev.cost);
    else if (!expense) addSpend(ev.period, ev.kind === 'overhaul' ? 'overhauls' : 'failures', ev.cost);
  }

  const endEngine = run.endEngine;
  const residual: ResidualDetail = {
    engineId: endEngine.id,
    engineAge: run.endAge,
    lifeHours: endEngine.lifeHours,
    overhaulCost: endEngine.overhaulCost,
    priceIndex: setup.generalIndex[n],
    credit: residualCredit(endEngine.overhaulCost, run.endAge, endEngine.lifeHours, setup.generalIndex[n]),
  };

  const periods: PeriodDetail[] = [];
  for (let y = 0; y <= n; y++) {
    const r = run.periods[y];
    const fuelPrice = a.fuelPrice * setup.fuelIndex[y];
    const carbonPrice = a.carbonPrice * setup.carbonIndex[y];
    const gen = setup.generalIndex[y];
    const co2 = co2Tonnes(r.fuelLitres, a.co2KgPerLitre);
    const fuel = r.fuelLitres * fuelPrice;
    const carbon = co2 * carbonPrice;
    const deductibleCosts = fuel + carbon + r.lube + r.lostMargin + (expense ? r.overhauls + r.failures : 0);
    const dep = depreciation[y];
    const wo = y === n ? writeOff : 0;
    const credit = y === n ? residual.credit : 0;
    const taxEffect = t * (deductibleCosts - r.extraMargin + dep + wo - credit);
    const breakdown: BreakdownEntry = {
      fuel: -fuel,
      carbon: -carbon,
      lube: -r.lube,
      overhauls: -r.overhauls,
      failures: -r.failures,
      capital: -r.capital,
      lostMargin: -r.lostMargin,
      extraMargin: r.extraMargin,
      taxEffect,
      residual: credit,
    };
    const cashFlow =
      breakdown.fuel + breakdown.carbon + breakdown.lube + breakdown.overhauls + breakdown.failures +
      breakdown.capital + breakdown.lostMargin + breakdown.extraMargin + breakdown.taxEffect + breakdown.residual;
    periods.push({
      period: y,
      hours: r.hours,
      fuelLitres: r.fuelLitres,
      co2Tonnes: co2,
      tonnes: r.tonnes,
      extraTonnes: r.extraTonnes,
      oilServices: r.oilServices,
      topUpLitres: r.topUpLitres,
      downtimeDays: r.downtimeDays,
      discountFactor: setup.discountFactor[y],
      priceIndex: { fuel: setup.fuelIndex[y], carbon: setup.carbonIndex[y], general: gen },
      prices: {
        fuel: fuelPrice,
        carbon: carbonPrice,
        lube: a.lubePrice * gen,
        labour: a.labourRate * gen,
        marginPerTonne: a.marginPerTonne * gen,
      },
      deductibleCosts,
      taxableGains: r.extraMargin,
      depreciation: dep,
      writeOff: wo,
      residualCredit: credit,
      breakdown,
      cashFlow,
    });
  }
  return { policy: run.policy, periods, segments: run.segments, events: run.events, spends, residual };
}
