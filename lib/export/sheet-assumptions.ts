/**
 * The Assumptions sheet: every assumption in one input cell with a defined
 * name, so each money formula of the workbook reads `FuelPrice`,
 * `DiscountRate` … and recomputes when that cell changes.
 */
import type ExcelJS from 'exceljs';
import type { CaseFile } from '@/lib/validation/case';
import { FMT, printSetup, setFormula, setText, setWidths, styleHeader, styleTitle } from './cells';

export const ASSUMPTIONS_SHEET = 'Assumptions';

interface Row {
  name: string;
  label: string;
  unit: string;
  value: number | string;
  fmt?: string;
  note?: string;
}

function rows(c: CaseFile): Row[] {
  const a = c.assumptions;
  const dep = a.depreciation;
  const cur = c.currency;
  return [
    { name: 'DiscountRate', label: 'Discount rate (nominal)', unit: 'per year', value: a.discountRate, fmt: FMT.rate4 },
    { name: 'Timing', label: 'Cash-flow timing', unit: 'end-of-year | mid-year', value: a.timing },
    { name: 'Inflation', label: 'Inflation (lube, kits, labour, overhauls, modules, margin, residual)', unit: 'per year', value: a.inflation, fmt: FMT.rate4 },
    { name: 'FuelPrice', label: 'Fuel price, year 1', unit: `${cur}/L`, value: a.fuelPrice, fmt: FMT.price },
    { name: 'FuelEscalation', label: 'Fuel price escalation', unit: 'per year', value: a.fuelEscalation, fmt: FMT.rate4 },
    { name: 'CO2KgPerLitre', label: 'CO2 per litre of fuel', unit: 'kg/L', value: a.co2KgPerLitre, fmt: FMT.price },
    { name: 'LubePrice', label: 'Lube oil price, year 1', unit: `${cur}/L`, value: a.lubePrice, fmt: FMT.price },
    { name: 'LabourRate', label: 'Labour rate, year 1', unit: `${cur}/h`, value: a.labourRate, fmt: FMT.money2 },
    { name: 'CarbonPrice', label: 'Carbon price, year 1', unit: `${cur}/t CO2`, value: a.carbonPrice, fmt: FMT.money2 },
    { name: 'CarbonEscalation', label: 'Carbon price escalation', unit: 'per year', value: a.carbonEscalation, fmt: FMT.rate4 },
    { name: 'MarginPerTonne', label: 'Margin per tonne hauled, year 1', unit: `${cur}/t`, value: a.marginPerTonne, fmt: FMT.price },
    { name: 'LostMarginShare', label: 'Share of a day down’s margin really lost (0: a standby truck covers it)', unit: '', value: a.lostMarginShare ?? 1, fmt: FMT.rate },
    { name: 'TaxRate', label: 'Tax rate', unit: '', value: a.taxRate, fmt: FMT.rate },
    { name: 'DepMethod', label: 'Depreciation method', unit: 'none | straight-line | declining-balance | macrs', value: dep.method },
    { name: 'DepYears', label: 'Depreciation years (MACRS class)', unit: 'years', value: 'years' in dep && dep.years ? dep.years : 7, fmt: FMT.count },
    { name: 'DepFactor', label: 'Declining-balance factor', unit: '', value: dep.method === 'declining-balance' ? (dep.factor ?? 2) : 2, fmt: FMT.qty2 },
    { name: 'RebuildAccounting', label: 'Overhauls and repairs', unit: 'expense | capitalise', value: a.rebuildAccounting },
  ];
}

/** Physical inputs: they decide hours, litres and event timing, so the blocks hold their results as values. */
function physicalRows(c: CaseFile): Row[] {
  const a = c.assumptions;
  return [
    { name: 'FuelDensity', label: 'Fuel density', unit: 'kg/L', value: a.fuelDensityKgPerL, fmt: FMT.price, note: 'sets litres burnt (values in the truck sheets)' },
    { name: 'HorizonCap', label: 'Horizon cap', unit: 'years', value: a.horizonYears ?? 'none', note: 'sets the years in each truck sheet' },
    {
      name: 'Valuation', label: 'Valuation', unit: 'expected | median-path', value: a.valuation ?? 'expected',
      note: a.valuation === 'median-path' ? 'events follow each engine’s median failure age' : 'events and services are expected counts over the engines’ failure ages',
    },
  ];
}

/** Writes the sheet and its defined names; returns nothing because formulas use the names. */
export function addAssumptionsSheet(wb: ExcelJS.Workbook, c: CaseFile): void {
  const ws = wb.addWorksheet(ASSUMPTIONS_SHEET, { views: [{ state: 'frozen', ySplit: 4 }], ...printSetup('4:4') });
  setWidths(ws, [58, 16, 40, 22, 44]);
  styleTitle(ws.getCell('A1'));
  ws.getCell('A1').value = 'Economic assumptions';
  ws.getCell('A2').value =
    'Change a blue input cell and every money figure in the workbook recomputes. Quantities (hours, litres, services, events) were computed for the inputs at the foot of the sheet.';
  const header = ws.getRow(4);
  header.values = ['Assumption', 'Value', 'Unit', 'Name in formulas'];
  styleHeader(header);

  let r = 5;
  const write = (row: Row, input: boolean) => {
    ws.getCell(r, 1).value = row.label;
    const v = ws.getCell(r, 2);
    v.value = row.value;
    if (row.fmt) v.numFmt = row.fmt;
    if (input) v.font = { color: { argb: 'FF1F4E9A' } };
    ws.getCell(r, 3).value = row.unit;
    ws.getCell(r, 4).value = row.name;
    ws.getCell(r, 4).font = { name: 'Consolas' };
    if (row.note) ws.getCell(r, 5).value = row.note;
    wb.definedNames.add(`'${ASSUMPTIONS_SHEET}'!$B$${r}`, row.name);
    r++;
  };
  for (const row of rows(c)) write(row, true);

  // derived switches, formulas on the inputs above so a changed method or timing flows through
  r++;
  ws.getCell(r, 1).value = 'Derived';
  ws.getCell(r, 1).font = { bold: true };
  r++;
  const derived: [string, string, string, number][] = [
    ['HalfYear', 'Discounting offset (0.5 for mid-year)', 'IF(Timing="mid-year",0.5,0)', c.assumptions.timing === 'mid-year' ? 0.5 : 0],
    ['CapitaliseRebuilds', 'Overhauls and repairs capitalised (1) or expensed (0)', 'IF(RebuildAccounting="capitalise",1,0)', c.assumptions.rebuildAccounting === 'capitalise' ? 1 : 0],
  ];
  for (const [name, label, formula, result] of derived) {
    ws.getCell(r, 1).value = label;
    setFormula(ws.getCell(r, 2), formula, result);
    ws.getCell(r, 4).value = name;
    ws.getCell(r, 4).font = { name: 'Consolas' };
    wb.definedNames.add(`'${ASSUMPTIONS_SHEET}'!$B$${r}`, name);
    r++;
  }

  r++;
  ws.getCell(r, 1).value = 'Physical inputs (shown for the record)';
  ws.getCell(r, 1).font = { bold: true };
  r++;
  for (const row of physicalRows(c)) write(row, false);
  r++;
  ws.getCell(r, 1).value = 'Currency';
  setText(ws.getCell(r, 2), c.currency);

  ws.commit();
}
