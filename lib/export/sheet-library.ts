/**
 * Engine types, repower offers and trucks as tables. Engine and offer money
 * figures are read by the truck sheets' formulas (overhaul cost, failure cost,
 * module price …), so a changed cost recomputes too.
 */
import type ExcelJS from 'exceljs';
import type { CaseFile, Engine, RepowerOffer } from '@/lib/validation/case';
import type { TruckDetail } from '@/lib/engine/types';
import { FMT, printSetup, setFormula, setText, setWidths, styleHeader, styleTitle, xref } from './cells';
import type { WorkbookMeta } from './types';

export const ENGINES_SHEET = 'Engines';
export const OFFERS_SHEET = 'Offers';
export const TRUCKS_SHEET = 'Trucks';
const FIRST = 5;

type EngineField = Exclude<keyof Engine, 'id'>;
const ENGINE_COLS: [EngineField, string, string][] = [
  ['ratedKw', 'Rated power (kW)', FMT.hours],
  ['bsfcGPerKwh', 'BSFC (g/kWh)', FMT.qty],
  ['lifeHours', 'Planned life (h)', FMT.hours],
  ['weibullShape', 'Weibull shape β', FMT.qty2],
  ['weibullScaleHours', 'Weibull scale η (h)', FMT.hours],
  ['overhaulCost', 'Overhaul cost', FMT.money],
  ['overhaulDowntimeDays', 'Overhaul days down', FMT.qty],
  ['failureCost', 'Failure repair cost', FMT.money],
  ['failureDowntimeDays', 'Failure days down', FMT.qty],
  ['serviceIntervalHours', 'Oil-service interval (h)', FMT.hours],
  ['sumpLitres', 'Sump (L)', FMT.hours],
  ['serviceKitCost', 'Service kit', FMT.money2],
  ['serviceLabourHours', 'Service labour (h)', FMT.qty],
  ['topUpLitresPerHour', 'Oil top-up (L/h)', FMT.qty2],
];
type OfferField = 'modulePrice' | 'installCost' | 'coreCredit' | 'capitalCost' | 'failedCoreCredit' | 'failedCapitalCost' | 'downtimeDays' | 'productivityGain';

export interface LibraryRefs {
  engine(id: string, field: EngineField): string;
  offer(id: string, field: OfferField): string;
}

function title(ws: ExcelJS.Worksheet, text: string, note: string, headers: string[]): void {
  styleTitle(ws.getCell('A1'));
  ws.getCell('A1').value = text;
  ws.getCell('A2').value = note;
  const h = ws.getRow(4);
  h.values = headers;
  styleHeader(h);
}

export function addLibrarySheets(wb: ExcelJS.Workbook, c: CaseFile, details: TruckDetail[], meta: WorkbookMeta): LibraryRefs {
  const cur = c.currency;
  // engines
  const ew = wb.addWorksheet(ENGINES_SHEET, { views: [{ state: 'frozen', ySplit: 4, xSplit: 1 }], ...printSetup('4:4') });
  setWidths(ew, [20, 22, ...ENGINE_COLS.map(() => 13), 40]);
  title(ew, 'Engine types', `Money in ${cur} at year-1 prices.`, [
    'Engine', 'Name', ...ENGINE_COLS.map(([, h]) => h.replace(/^(Overhaul cost|Failure repair cost|Service kit)$/, `$1 (${cur})`)), 'Notes',
  ]);
  const engineRow = new Map<string, number>();
  c.engines.forEach((e, i) => {
    const r = FIRST + i;
    engineRow.set(e.id, r);
    setText(ew.getCell(r, 1), e.id);
    setText(ew.getCell(r, 2), meta.engines?.[e.id]?.name ?? '');
    ENGINE_COLS.forEach(([f, , fmt], k) => {
      const cell = ew.getCell(r, 3 + k);
      cell.value = e[f];
      cell.numFmt = fmt;
    });
    setText(ew.getCell(r, 3 + ENGINE_COLS.length), meta.engines?.[e.id]?.notes ?? '');
  });
  ew.commit();

  // offers
  const ow = wb.addWorksheet(OFFERS_SHEET, { views: [{ state: 'frozen', ySplit: 4, xSplit: 1 }], ...printSetup('4:4') });
  setWidths(ow, [20, 24, 20, 15, 15, 15, 15, 15, 15, 10, 12, 12, 40]);
  const offerCols: [OfferField, string, string][] = [
    ['modulePrice', `Module price (${cur})`, FMT.money],
    ['installCost', `Install cost (${cur})`, FMT.money],
    ['coreCredit', `Core credit (${cur})`, FMT.money],
    ['capitalCost', `Capital cost (${cur})`, FMT.money],
    ['failedCoreCredit', `Failed core credit (${cur})`, FMT.money],
    ['failedCapitalCost', `Capital cost of a failed swap (${cur})`, FMT.money],
    ['downtimeDays', 'Days down', FMT.qty],
    ['productivityGain', 'Productivity gain', FMT.rate],
  ];
  title(ow, 'Repower offers', `Capital cost = module + install − core credit, at year-1 prices; a swap brought forward by a failure earns the failed core credit (blank in the case: the core credit).`, [
    'Offer', 'Supplier', 'Engine fitted', ...offerCols.map(([, h]) => h), 'Timing', 'Notes',
  ]);
  const offerRow = new Map<string, number>();
  c.repowerOffers.forEach((o: RepowerOffer, i) => {
    const r = FIRST + i;
    offerRow.set(o.id, r);
    setText(ow.getCell(r, 1), o.id);
    setText(ow.getCell(r, 2), meta.offers?.[o.id]?.supplier ?? '');
    setText(ow.getCell(r, 3), o.engineId);
    offerCols.forEach(([f, , fmt], k) => {
      const cell = ow.getCell(r, 4 + k);
      const failedCore = o.failedCoreCredit ?? o.coreCredit;
      if (f === 'capitalCost') setFormula(cell, `D${r}+E${r}-F${r}`, o.modulePrice + o.installCost - o.coreCredit);
      else if (f === 'failedCapitalCost') setFormula(cell, `D${r}+E${r}-H${r}`, o.modulePrice + o.installCost - failedCore);
      else if (f === 'failedCoreCredit') cell.value = failedCore;
      else cell.value = o[f];
      cell.numFmt = fmt;
    });
    ow.getCell(r, 4 + offerCols.length).value = o.timing;
    setText(ow.getCell(r, 5 + offerCols.length), meta.offers?.[o.id]?.notes ?? '');
  });
  ow.commit();

  // trucks
  const tw = wb.addWorksheet(TRUCKS_SHEET, { views: [{ state: 'frozen', ySplit: 4, xSplit: 1 }], ...printSetup('4:4') });
  setWidths(tw, [14, 12, 18, 18, 12, 12, 12, 10, 12, 12, 10, 12, 12, 12, 12, 40]);
  title(tw, 'Trucks', 'Fleet register as used by this case; burn is calibrated to the measured figure where there is one.', [
    'Unit', 'Payload class', 'Engine', 'Repower offer', 'Engine hours (h)', 'Remaining life (h)', 'Annual hours (h)',
    'Load factor', 'Tonnes per hour (t/h)', 'Measured burn (L/h)', 'Horizon (years)', 'Power demand (kW)',
    'Calibration factor', 'Burn, engine now (L/h)', 'Burn, repower engine (L/h)', 'Notes',
  ]);
  c.trucks.forEach((t, i) => {
    const r = FIRST + i;
    const d = details[i];
    setText(tw.getCell(r, 1), t.id);
    setText(tw.getCell(r, 2), meta.trucks?.[t.id]?.payloadClass ?? '');
    setText(tw.getCell(r, 3), t.engineId);
    setText(tw.getCell(r, 4), t.repowerOfferId);
    const vals: [number | null, string][] = [
      [t.engineHours, FMT.hours], [t.remainingLifeHours, FMT.hours], [t.annualHours, FMT.hours], [t.loadFactor, FMT.qty2],
      [t.tonnesPerHour, FMT.qty], [t.fuelBurnLitresPerHour, FMT.qty], [d.horizonYears, FMT.count], [d.powerKw, FMT.qty],
      [d.calibrationFactor, FMT.factor], [d.burnLitresPerHour[d.startEngineId], FMT.qty2], [d.burnLitresPerHour[d.repowerEngineId], FMT.qty2],
    ];
    vals.forEach(([v, fmt], k) => {
      const cell = tw.getCell(r, 5 + k);
      cell.value = v;
      cell.numFmt = fmt;
    });
    setText(tw.getCell(r, 16), meta.trucks?.[t.id]?.notes ?? '');
    tw.getRow(r).commit();
  });
  tw.commit();

  const engineCol = (f: EngineField) => 3 + ENGINE_COLS.findIndex(([k]) => k === f);
  const offerCol = (f: OfferField) => 4 + offerCols.findIndex(([k]) => k === f);
  return {
    engine: (id, f) => xref(ENGINES_SHEET, engineRow.get(id) as number, engineCol(f)),
    offer: (id, f) => xref(OFFERS_SHEET, offerRow.get(id) as number, offerCol(f)),
  };
}
