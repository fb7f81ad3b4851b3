/**
 * The Cover sheet: what the case is, whose, in which currency, its status and
 * approval stamp, how the figures are made, and the safety caution.
 */
import type ExcelJS from 'exceljs';
import type { CaseFile } from '@/lib/validation/case';
import { printSetup, setText, setWidths, styleTitle } from './cells';
import type { WorkbookMeta } from './types';

export const COVER_SHEET = 'Cover';

const METHOD = [
  'Each truck is valued under three policies over its remaining life: keep (run the engine, repair it at each failure), rebuild (overhaul at each planned life) and repower (fit the offered engine module, then overhaul it at each planned life).',
  'With the expected valuation (the default) every event and oil service is an expected count over the engines’ Weibull failure ages, so counts are fractions; with the median path, engine events follow each engine’s median failure age. Hours, litres, oil services, tonnes and events are the engine’s results, written as values; every money figure is a formula on the Assumptions sheet, the Engines and Offers tables and those quantities.',
  'Prices in the case are year-1 prices escalated each year; cash flows fall at the end of each year (or mid-year where set) and are discounted at the nominal discount rate. Tax relief is immediate; capital is depreciated by the method on the Assumptions sheet (MACRS shares on the Depreciation sheet), with the undepreciated basis written off at the end of the horizon, where the engine fitted is credited for its unused hours.',
  'NPV is negative for a cost. IRR is shown only when ΔCF starts with an investment and has exactly one rate of return between −99 % and 1000 % (counted on the IRR grid sheet); otherwise it reads n/a, and MIRR at the discount rate is the figure to read. Payback reads n/a when it is never reached.',
  'Changing an assumption recomputes every money figure. Changing a physical input (hours, engine life, burn) needs a new export, because it moves the events themselves.',
];

const CAUTION =
  'These figures inform a capital decision; they do not certify an engine installation. Mechanical and electrical work on haul trucks follows the manufacturer’s procedures, site safety rules and local codes, and is done by licensed people.';

export function addCoverSheet(wb: ExcelJS.Workbook, c: CaseFile, meta: WorkbookMeta): void {
  const ws = wb.addWorksheet(COVER_SHEET, printSetup());
  setWidths(ws, [26, 110]);
  ws.getCell('A1').value = 'Haulcase business case';
  styleTitle(ws.getCell('A1'), 18);
  const generated = meta.generatedAt ?? new Date();
  const rows: [string, string][] = [
    ['Case', c.name],
    ['Workspace', meta.workspaceName ?? ''],
    ['Currency', c.currency],
    ['Assumption set', meta.assumptionSetName ?? ''],
    ['Status', meta.status ?? 'not saved (exported from a case file)'],
    ['Exported', generated.toISOString().replace('T', ' ').slice(0, 16) + ' UTC'],
    ['Trucks', String(c.trucks.length)],
  ];
  if (meta.approval) {
    rows.push(['Approved by', meta.approval.approvedBy], ['Approved at', meta.approval.approvedAt], ['Record hash (SHA-256)', meta.approval.hash]);
  }
  let r = 3;
  for (const [label, value] of rows) {
    ws.getCell(r, 1).value = label;
    ws.getCell(r, 1).font = { bold: true };
    setText(ws.getCell(r, 2), value); // user-typed names stay text
    r++;
  }
  r++;
  ws.getCell(r, 1).value = 'Method';
  ws.getCell(r, 1).font = { bold: true, size: 12 };
  r++;
  for (const line of METHOD) {
    ws.mergeCells(r, 1, r, 2);
    ws.getCell(r, 1).value = line;
    ws.getCell(r, 1).alignment = { wrapText: true, vertical: 'top' };
    ws.getRow(r).height = 48;
    r++;
  }
  r++;
  ws.mergeCells(r, 1, r, 2);
  const caution = ws.getCell(r, 1);
  caution.value = `Caution: ${CAUTION}`;
  caution.alignment = { wrapText: true, vertical: 'top' };
  caution.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFFFF4D6' } };
  caution.font = { color: { argb: 'FF7A4B00' } };
  ws.getRow(r).height = 48;
  r += 2;
  ws.getCell(r, 1).value = 'Sheets';
  ws.getCell(r, 1).font = { bold: true };
  ws.getCell(r, 2).value = 'Summary · Assumptions · Depreciation · Engines · Offers · Trucks · one sheet per truck (T1 …) · Plan (when the case has one) · IRR grid';
  ws.commit();
}
