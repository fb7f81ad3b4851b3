/**
 * The readings import template (issue 20): the import's own columns
 * (READING_COLUMNS), header only, so nothing invented is imported by mistake.
 * The XLSX adds a "Columns" sheet saying what each column holds, with an
 * example value; the examples together make one row the import accepts
 * (given a truck and an engine type with those keys).
 */
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { READING_COLUMNS } from './import-plan';

type ColumnName = (typeof READING_COLUMNS)[number]['name'];

/** Examples when the workspace has no truck or engine type to name. */
export const EXAMPLE_UNIT = 'T-101';
export const EXAMPLE_ENGINE = 'new-engine-key';

/** One example per column, as typed in a sheet (text; numbers without grouping). */
export function readingExamples(keys: { unit?: string; engine?: string } = {}): Record<ColumnName, string> {
  return {
    unit_number: keys.unit ?? EXAMPLE_UNIT,
    month: '2026-04',
    hour_meter_h: '18950',
    fuel_l: '148500',
    tonnes_t: '352000',
    overhauls: '0',
    failures: '0',
    days_down: '3',
    repower_date: '2026-04-17',
    repower_cost: '1540000',
    repower_engine_type: keys.engine ?? EXAMPLE_ENGINE,
    notes: 'Repowered at the April shutdown',
  };
}

const header = READING_COLUMNS.map((c) => c.name);

/** The CSV template: the header line only. */
export function readingsTemplateCsv(): string {
  return `${Papa.unparse([header])}\r\n`;
}

/**
 * The XLSX template: a "Readings" sheet to fill in (header only) and a
 * "Columns" sheet with each column, whether it is required, what it holds and
 * an example (the workspace's first unit number and engine key when given).
 */
export async function readingsTemplateXlsx(keys: { unit?: string; engine?: string; engines?: string[] } = {}): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Haulcase';
  const sheet = wb.addWorksheet('Readings', { views: [{ state: 'frozen', ySplit: 1 }] });
  sheet.addRow(header).font = { bold: true };
  READING_COLUMNS.forEach((c, i) => {
    sheet.getColumn(i + 1).width = Math.max(14, c.name.length + 4);
    // months and dates stay text, as the import reads them best
    if (c.kind === 'month' || c.kind === 'date') sheet.getColumn(i + 1).numFmt = '@';
  });
  const examples = readingExamples(keys);
  const help = wb.addWorksheet('Columns');
  help.addRow(['column', 'required', 'what it holds', 'example']).font = { bold: true };
  for (const c of READING_COLUMNS) help.addRow([c.name, c.required ? 'yes' : 'no', c.help, examples[c.name]]);
  help.addRow([]);
  help.addRow(['engine type keys in this workspace', keys.engines?.length ? keys.engines.join(', ') : '(none yet: add engine types first)']);
  help.addRow(['rules', 'Only the first sheet is read. One row per truck and month; enter values, not formulas. Row numbers in error messages are the sheet\'s own row numbers. The whole file is saved or nothing.']);
  help.getColumn(1).width = 36;
  help.getColumn(3).width = 90;
  help.getColumn(4).width = 32;
  return new Uint8Array(await wb.xlsx.writeBuffer());
}
