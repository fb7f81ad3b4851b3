import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { IMPORT_LIMITS } from './columns';

/** A cell as read: text or number, or a marker for a spreadsheet formula (refused: we import values, not formulas). */
export type Cell = string | number | { formula: string } | null;
export type Table = { header: string[]; rows: Array<{ row: number; cells: Cell[] }> };

/** A problem with the file as a whole: wrong type, too large, empty, too many rows. */
export class FileProblem extends Error {}

const isZip = (b: Uint8Array) => b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04;

function looksLikeText(b: Uint8Array): boolean {
  const n = Math.min(b.length, 8192);
  for (let i = 0; i < n; i++) if (b[i] === 0) return false;
  return true;
}

const blank = (c: Cell) => c === null || (typeof c === 'string' && c.trim() === '');

function tooMany(count: number) {
  return new FileProblem(`The file has ${count.toLocaleString('en-US')} data rows; the limit is ${IMPORT_LIMITS.maxRows.toLocaleString('en-US')}. Split it into smaller files.`);
}

/**
 * Reads a CSV or XLSX file into a header and data rows; row numbers are the
 * file's own (header = row 1), so a person can find them in the spreadsheet.
 * Blank rows are skipped. The kind is decided from the contents, not the name.
 */
export async function readTable(fileName: string, bytes: Uint8Array): Promise<Table> {
  if (bytes.length === 0) throw new FileProblem('The file is empty.');
  if (bytes.length > IMPORT_LIMITS.maxBytes) {
    throw new FileProblem(`The file is ${(bytes.length / 1048576).toFixed(1)} MB; the limit is 5 MB.`);
  }
  const lower = fileName.toLowerCase();
  if (lower.endsWith('.xlsx') && isZip(bytes)) return readXlsx(bytes);
  if (lower.endsWith('.csv') && looksLikeText(bytes) && !isZip(bytes)) return readCsv(bytes);
  throw new FileProblem(`"${fileName}" is not a CSV or XLSX file. Download the template and save your sheet as .csv or .xlsx.`);
}

function readCsv(bytes: Uint8Array): Table {
  let text = new TextDecoder('utf-8').decode(bytes);
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // a byte-order mark from spreadsheet programs
  const parsed = Papa.parse<string[]>(text, { skipEmptyLines: false });
  const data = parsed.data;
  const header = (data[0] ?? []).map((h) => String(h).trim());
  const rows: Table['rows'] = [];
  for (let i = 1; i < data.length; i++) {
    const cells: Cell[] = data[i].map((c) => c);
    if (cells.every(blank)) continue;
    rows.push({ row: i + 1, cells });
    if (rows.length > IMPORT_LIMITS.maxRows) throw tooMany(countNonBlank(data.slice(1)));
  }
  if (header.every((h) => h === '') && rows.length === 0) throw new FileProblem('The file is empty.');
  return { header, rows };
}

const countNonBlank = (data: string[][]) => data.filter((r) => !r.every(blank)).length;

function cellValue(v: ExcelJS.CellValue): Cell {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string') return v;
  if (typeof v === 'boolean') return String(v);
  if (v instanceof Date) return v.toISOString();
  if (typeof v === 'object') {
    if ('formula' in v || 'sharedFormula' in v) return { formula: String((v as { formula?: string }).formula ?? '') };
    if ('richText' in v) return v.richText.map((r) => r.text).join('');
    if ('text' in v) return String(v.text);
    if ('error' in v) return String(v.error);
  }
  return String(v);
}

async function readXlsx(bytes: Uint8Array): Promise<Table> {
  const wb = new ExcelJS.Workbook();
  try {
    await wb.xlsx.load(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
  } catch {
    throw new FileProblem('The file is not a readable XLSX workbook.');
  }
  const ws = wb.worksheets[0];
  if (!ws || ws.actualRowCount === 0) throw new FileProblem('The file is empty.');
  const asCells = (r: ExcelJS.Row) => {
    const vals = r.values as ExcelJS.CellValue[];
    return Array.from({ length: Math.max(0, vals.length - 1) }, (_, i) => cellValue(vals[i + 1]));
  };
  const header = asCells(ws.getRow(1)).map((c) => (c === null ? '' : typeof c === 'object' ? '' : String(c).trim()));
  const rows: Table['rows'] = [];
  let total = 0;
  ws.eachRow({ includeEmpty: false }, (r, n) => {
    if (n === 1) return;
    const cells = asCells(r);
    if (cells.every(blank)) return;
    total++;
    if (rows.length <= IMPORT_LIMITS.maxRows) rows.push({ row: n, cells });
  });
  if (total > IMPORT_LIMITS.maxRows) throw tooMany(total);
  return { header, rows };
}
