import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { FLEET_COLUMNS } from './columns';

const header = FLEET_COLUMNS.map((c) => c.name);

/** The CSV template: the header line only, so nothing invented is imported by mistake. */
export function fleetTemplateCsv(): string {
  return `${Papa.unparse([header])}\r\n`;
}

/** The XLSX template: a "Fleet" sheet to fill in and a "Columns" sheet explaining each column and the keys in use. */
export async function fleetTemplateXlsx(keys: { engines: string[]; offers: string[] }): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Haulcase';
  const fleet = wb.addWorksheet('Fleet', { views: [{ state: 'frozen', ySplit: 1 }] });
  fleet.addRow(header).font = { bold: true };
  FLEET_COLUMNS.forEach((c, i) => {
    fleet.getColumn(i + 1).width = Math.max(14, c.name.length + 4);
  });
  const help = wb.addWorksheet('Columns');
  help.addRow(['column', 'required', 'what it holds']).font = { bold: true };
  for (const c of FLEET_COLUMNS) help.addRow([c.name, c.required ? 'yes' : 'no', c.help]);
  help.addRow([]);
  help.addRow(['engine_type keys in this workspace', keys.engines.join(', ') || '(none yet: add engine types first)']);
  help.addRow(['repower_offer keys in this workspace', keys.offers.join(', ') || '(none yet)']);
  help.addRow(['rules', 'Only the first sheet is read. Enter values, not formulas. Row numbers in error messages are the sheet\'s own row numbers.']);
  help.getColumn(1).width = 36;
  help.getColumn(3).width = 90;
  return new Uint8Array(await wb.xlsx.writeBuffer());
}
