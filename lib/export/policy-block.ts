/**
 * One policy's cash-flow block on a truck sheet: one row per year, the
 * engine's physical quantities as values and every money figure as a formula
 * on the Assumptions names, the Engines/Offers tables, the Depreciation shares
 * and those quantities (MODEL.md sections 2–8). Ends in NPV, EAC and the
 * levelised costs.
 */
import type ExcelJS from 'exceljs';
import type { PolicyDetail, PolicyKey, PolicyResult, TruckDetail } from '@/lib/engine/types';
import type { CaseFile } from '@/lib/validation/case';
import { FMT, addr, setFormula } from './cells';
import type { DepreciationRefs } from './sheet-depreciation';
import type { LibraryRefs } from './sheet-library';

/** Column of each figure in a block (1-based); the header row of the sheet follows this order. */
export const C = {
  year: 1, hours: 2, litres: 3, co2: 4, tonnes: 5, extraTonnes: 6, servicesStart: 7, servicesNew: 8, topUp: 9,
  daysDown: 10, lostTonnes: 11, overhauls: 12, failures: 13, repowers: 14,
  fuelIdx: 15, carbonIdx: 16, genIdx: 17,
  fuel: 18, carbon: 19, lube: 20, overhaulCost: 21, failureCost: 22, capital: 23, lostMargin: 24, extraMargin: 25,
  depreciable: 26, depreciation: 27, writeOff: 28, residual: 29, taxEffect: 30, cashFlow: 31, df: 32, pv: 33,
  plannedRepowers: 34, failedRepowers: 35,
} as const;

export function blockHeaders(currency: string): string[] {
  const m = (s: string) => `${s} (${currency})`;
  return [
    'Year', 'Hours (h)', 'Fuel (L)', 'CO2 (t)', 'Tonnes hauled (t)', 'Extra tonnes from repower (t)',
    'Oil services, engine now (no.)', 'Oil services, repower engine (no.)', 'Oil top-up (L)', 'Days down',
    'Production lost to days down (t)', 'Overhauls (no.)', 'Failures (no.)', 'Repowers (no.)',
    'Fuel price index', 'Carbon price index', 'General price index',
    m('Fuel'), m('Carbon'), m('Lube'), m('Overhauls'), m('Failure repairs'), m('Repower capital'), m('Lost margin'),
    m('Extra margin'), m('Depreciable spend'), m('Depreciation'), m('Write-off'), m('Residual credit'), m('Tax effect'),
    m('Cash flow'), 'Discount factor', m('Present value'), 'Planned repowers (no.)', 'Failed swaps (no.)',
  ];
}

export const POLICY_TITLES: Record<PolicyKey, string> = {
  keep: 'Keep: run the engine, repair it at each failure',
  rebuild: 'Rebuild: overhaul at each planned life (repair if it fails first)',
  repower: 'Repower: fit the offered module, then overhaul it at each planned life',
};

/** Rows of a written block, for the comparison section and the Summary sheet. */
export interface BlockRefs {
  firstRow: number;
  lastRow: number;
  npv: string;
  eac: string;
  costPerHour: string;
  costPerTonne: string;
  /** capital spent on the repower, undiscounted, positive */
  capital: string;
  /** the row after the block */
  nextRow: number;
}

export interface BlockContext {
  ws: ExcelJS.Worksheet;
  caseFile: CaseFile;
  truck: TruckDetail;
  annualHours: number;
  /** absolute address of the cell holding N on this sheet */
  horizonCell: string;
  lib: LibraryRefs;
  dep: DepreciationRefs;
}

/** Where a block of horizon n starting at `startRow` puts its figures (so the Summary can refer to them before the truck sheet is written). */
export function blockRefs(startRow: number, n: number): BlockRefs {
  const first = startRow + 1;
  const last = first + n;
  const res0 = last + 1;
  return {
    firstRow: first,
    lastRow: last,
    npv: addr(res0, 2, true),
    eac: addr(res0 + 1, 2, true),
    costPerHour: addr(res0 + 2, 2, true),
    costPerTonne: addr(res0 + 3, 2, true),
    capital: addr(res0 + 6, 2, true),
    nextRow: res0 + 9,
  };
}

/** The engine whose overhauls and repairs a policy books: the repower engine under repower, else the one fitted now. */
function eventEngine(p: PolicyDetail, truck: TruckDetail): string {
  const id = p.policy === 'repower' ? truck.repowerEngineId : truck.startEngineId;
  for (const e of p.events) {
    if (e.kind !== 'repower' && e.engineId !== id) throw new Error(`unexpected ${e.kind} of engine ${e.engineId} under ${p.policy}`);
  }
  return id;
}

export function writePolicyBlock(ctx: BlockContext, p: PolicyDetail, res: PolicyResult, startRow: number): BlockRefs {
  const { ws, truck, lib, dep } = ctx;
  const n = truck.horizonYears;
  const capitalise = ctx.caseFile.assumptions.rebuildAccounting === 'capitalise';
  const title = ws.getCell(startRow, 1);
  title.value = POLICY_TITLES[p.policy];
  title.font = { bold: true, size: 12, color: { argb: { keep: 'FF8C837B', rebuild: 'FF35618F', repower: 'FFB0562B' }[p.policy] } };
  const first = startRow + 1;
  const last = first + n;
  const row = (y: number) => first + y;
  const q = p.quantities;
  // expected counts are fractions: shown to 4 decimals, as values (every money figure stays a formula over them)
  const countFmt = p.valuation === 'expected' ? '0.0000' : FMT.count;
  const ev = eventEngine(p, truck);
  const start = truck.startEngineId;
  const next = truck.repowerEngineId;
  const svc = (id: string) =>
    `(${lib.engine(id, 'sumpLitres')}*LubePrice+${lib.engine(id, 'serviceKitCost')}+${lib.engine(id, 'serviceLabourHours')}*LabourRate)`;
  // periods where a spend may be depreciated: any event (capitalised rebuilds are a live switch)
  const spendPeriods = q
    .map((x, y) => (x.overhauls + x.repairs + x.plannedRepowers + x.failedRepowers > 0 ? y : -1))
    .filter((y) => y >= 0);

  for (let y = 0; y <= n; y++) {
    const r = row(y);
    const d = p.periods[y];
    const b = d.breakdown;
    const at = (col: number) => addr(r, col);
    const line = ws.getRow(r);
    const put = (col: number, v: number, fmt: string) => {
      const cell = line.getCell(col);
      cell.value = v;
      cell.numFmt = fmt;
    };
    const f = (col: number, formula: string, result: number, fmt: string = FMT.money) => {
      const cell = line.getCell(col);
      setFormula(cell, formula, result);
      cell.numFmt = fmt;
    };
    put(C.year, y, FMT.count);
    put(C.hours, d.hours, FMT.hours);
    put(C.litres, d.fuelLitres, FMT.hours);
    f(C.co2, `${at(C.litres)}*CO2KgPerLitre/1000`, d.co2Tonnes, FMT.qty);
    put(C.tonnes, d.tonnes, FMT.hours);
    put(C.extraTonnes, d.extraTonnes, FMT.hours);
    put(C.servicesStart, q[y].servicesStart, countFmt);
    put(C.servicesNew, q[y].servicesNew, countFmt);
    put(C.topUp, d.topUpLitres, FMT.qty);
    put(C.daysDown, d.downtimeDays, FMT.qty);
    put(C.lostTonnes, q[y].lostTonnes, FMT.qty);
    put(C.overhauls, q[y].overhauls, countFmt);
    put(C.failures, q[y].repairs, countFmt);
    put(C.repowers, q[y].plannedRepowers + q[y].failedRepowers, countFmt);
    put(C.plannedRepowers, q[y].plannedRepowers, countFmt);
    put(C.failedRepowers, q[y].failedRepowers, countFmt);
    const yr = at(C.year);
    f(C.fuelIdx, `IF(${yr}=0,1,(1+FuelEscalation)^(${yr}-1))`, d.priceIndex.fuel, FMT.index);
    f(C.carbonIdx, `IF(${yr}=0,1,(1+CarbonEscalation)^(${yr}-1))`, d.priceIndex.carbon, FMT.index);
    f(C.genIdx, `IF(${yr}=0,1,(1+Inflation)^(${yr}-1))`, d.priceIndex.general, FMT.index);
    const g = at(C.genIdx);
    f(C.fuel, `-${at(C.litres)}*FuelPrice*${at(C.fuelIdx)}`, b.fuel);
    f(C.carbon, `-${at(C.co2)}*CarbonPrice*${at(C.carbonIdx)}`, b.carbon);
    f(C.lube, `-${g}*(${at(C.servicesStart)}*${svc(start)}+${at(C.servicesNew)}*${svc(next)}+${at(C.topUp)}*LubePrice)`, b.lube);
    f(C.overhaulCost, `-${at(C.overhauls)}*${lib.engine(ev, 'overhaulCost')}*${g}`, b.overhauls);
    f(C.failureCost, `-${at(C.failures)}*${lib.engine(ev, 'failureCost')}*${g}`, b.failures);
    f(
      C.capital,
      `-(${at(C.plannedRepowers)}*${lib.offer(truck.repowerOfferId, 'capitalCost')}+${at(C.failedRepowers)}*${lib.offer(truck.repowerOfferId, 'failedCapitalCost')})*${g}`,
      b.capital,
    );
    f(C.lostMargin, `-${at(C.lostTonnes)}*MarginPerTonne*LostMarginShare*${g}`, b.lostMargin);
    f(C.extraMargin, `${at(C.extraTonnes)}*MarginPerTonne*${g}`, b.extraMargin);
    const spend = -b.capital - (capitalise ? b.overhauls + b.failures : 0);
    f(C.depreciable, `-${at(C.capital)}-CapitaliseRebuilds*(${at(C.overhaulCost)}+${at(C.failureCost)})`, spend);
    const shares = spendPeriods
      .filter((s) => y >= 1 && Math.max(s, 1) <= y)
      .map((s) => `${addr(row(s), C.depreciable)}*${dep.share(y - Math.max(s, 1) + 1)}`);
    f(C.depreciation, shares.length ? shares.join('+') : '0', d.depreciation);
    if (y === n) {
      const left = spendPeriods.map((s) => `${addr(row(s), C.depreciable)}*${dep.left(n - Math.max(s, 1) + 1)}`);
      f(C.writeOff, left.length ? left.join('+') : '0', d.writeOff);
      const e = p.residual.engineId;
      f(
        C.residual,
        `${lib.engine(e, 'overhaulCost')}*MAX(0,1-${addr(last + 8, 2)}/${lib.engine(e, 'lifeHours')})*${g}`,
        b.residual,
      );
    } else {
      put(C.writeOff, 0, FMT.money);
      put(C.residual, 0, FMT.money);
    }
    f(
      C.taxEffect,
      `TaxRate*(-(${at(C.fuel)}+${at(C.carbon)}+${at(C.lube)}+${at(C.lostMargin)})-(1-CapitaliseRebuilds)*(${at(C.overhaulCost)}+${at(C.failureCost)})-${at(C.extraMargin)}+${at(C.depreciation)}+${at(C.writeOff)}-${at(C.residual)})`,
      b.taxEffect,
    );
    const sum = [C.fuel, C.carbon, C.lube, C.overhaulCost, C.failureCost, C.capital, C.lostMargin, C.extraMargin, C.taxEffect, C.residual]
      .map(at)
      .join('+');
    f(C.cashFlow, sum, d.cashFlow);
    f(C.df, `IF(${yr}=0,1,(1+DiscountRate)^-(${yr}-HalfYear))`, d.discountFactor, FMT.factor);
    f(C.pv, `${at(C.cashFlow)}*${at(C.df)}`, d.cashFlow * d.discountFactor);
  }

  const range = (col: number) => `${addr(first, col)}:${addr(last, col)}`;
  const res0 = last + 1;
  const results: [string, string, number, string][] = [
    ['NPV', `SUM(${range(C.pv)})`, res.npv, FMT.money],
    ['Equivalent annual cost (EAC)', `PMT(DiscountRate,${ctx.horizonCell},${addr(res0, 2)})`, res.eac, FMT.money],
    ['Cost per operating hour', `-(${addr(res0, 2)}-(1-TaxRate)*SUMPRODUCT(${range(C.extraMargin)},${range(C.df)}))/SUMPRODUCT(${range(C.hours)},${range(C.df)})`, res.costPerHour, FMT.money2],
    ['Cost per tonne', `-(${addr(res0, 2)}-(1-TaxRate)*SUMPRODUCT(${range(C.extraMargin)},${range(C.df)}))/SUMPRODUCT(${range(C.tonnes)},${range(C.df)})`, res.costPerTonne, FMT.price],
    ['Fuel over the horizon (L)', `SUM(${range(C.litres)})`, res.fuelLitres, FMT.hours],
    ['CO2 over the horizon (t)', `SUM(${range(C.co2)})`, res.co2Tonnes, FMT.qty],
    ['Capital spent on the repower, undiscounted', `-SUM(${range(C.capital)})`, -res.breakdown.reduce((s, x) => s + x.capital, 0), FMT.money],
  ];
  results.forEach(([label, formula, value, fmt], i) => {
    const r = res0 + i;
    ws.getCell(r, 1).value = label;
    ws.getCell(r, 1).font = { bold: i === 0 };
    const cell = ws.getCell(r, 2);
    setFormula(cell, formula, value);
    cell.numFmt = fmt;
    cell.font = { bold: i === 0 };
  });
  // value the residual formula reads (a physical state: hours on the engine at the end)
  const ageRow = res0 + results.length;
  ws.getCell(ageRow, 1).value =
    p.valuation === 'expected'
      ? `Equivalent hours on ${p.residual.engineId} at the end of year N (the expected unused life of every engine that may be fitted then)`
      : `Hours on the fitted engine at the end of year N (${p.residual.engineId})`;
  ws.getCell(ageRow, 2).value = p.residual.engineAge;
  ws.getCell(ageRow, 2).numFmt = FMT.hours;
  if (ageRow !== last + 8) throw new Error('block layout: residual age row moved');
  ws.getRow(ageRow).commit();
  return blockRefs(startRow, n);
}
