import { Readable } from 'node:stream';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { FLEET_COLUMNS, IMPORT_LIMITS } from './columns';
import { FileProblem } from './file-problem';
import { checkDeclaredSizes, checkInflatedSize, readZipDirectory, rebuildZip, type ZipEntry, type ZipPart } from './zip-directory';

export { FileProblem };

/** A cell as read: text or number, or a marker for a spreadsheet formula (refused: we import values, not formulas). */
export type Cell = string | number | { formula: string } | null;
export type Table = { header: string[]; rows: Array<{ row: number; cells: Cell[] }> };

const isZip = (b: Uint8Array) => b[0] === 0x50 && b[1] === 0x4b && b[2] === 0x03 && b[3] === 0x04;

function looksLikeText(b: Uint8Array): boolean {
  const n = Math.min(b.length, 8192);
  for (let i = 0; i < n; i++) if (b[i] === 0) return false;
  return true;
}

const blank = (c: Cell | undefined) => c === null || c === undefined || (typeof c === 'string' && c.trim() === '');
const num = (n: number) => n.toLocaleString('en-US');

/** The number of columns up to the last non-empty cell. */
function usedColumns(cells: Cell[]): number {
  let n = cells.length;
  while (n > 0 && blank(cells[n - 1])) n--;
  return n;
}

const tooManyColumns = (row: number, columns: number) =>
  new FileProblem(`Row ${num(row)} has ${num(columns)} columns; the limit is ${IMPORT_LIMITS.maxColumns}. The fleet sheet has ${FLEET_COLUMNS.length} columns: remove the others.`);

/**
 * Reads a CSV or XLSX file into a header and data rows; row numbers are the
 * file's own (header = row 1), so a person can find them in the spreadsheet.
 * Blank rows are skipped. The kind is decided from the contents, not the name.
 * Limits (IMPORT_LIMITS): 5 MB, 10,000 data rows, 100 columns; an XLSX
 * archive is also judged by its table of contents before anything is unpacked.
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

// ---------------------------------------------------------------------------
// CSV

/**
 * The offset of the first byte that is not well-formed UTF-8 (the Unicode
 * Standard, table 3-7: no overlong forms, no surrogates, nothing above
 * U+10FFFF, no truncated sequence), or -1.
 */
export function firstInvalidUtf8(b: Uint8Array): number {
  let i = 0;
  while (i < b.length) {
    const c = b[i];
    if (c < 0x80) {
      i++;
      continue;
    }
    let need: number;
    let lo = 0x80;
    let hi = 0xbf;
    if (c >= 0xc2 && c <= 0xdf) need = 1;
    else if (c >= 0xe0 && c <= 0xef) {
      need = 2;
      if (c === 0xe0) lo = 0xa0;
      if (c === 0xed) hi = 0x9f;
    } else if (c >= 0xf0 && c <= 0xf4) {
      need = 3;
      if (c === 0xf0) lo = 0x90;
      if (c === 0xf4) hi = 0x8f;
    } else return i;
    for (let k = 1; k <= need; k++) {
      const d = b[i + k];
      if (d === undefined || d < (k === 1 ? lo : 0x80) || d > (k === 1 ? hi : 0xbf)) return i;
    }
    i += need + 1;
  }
  return -1;
}

function decodeUtf8(bytes: Uint8Array): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    const at = firstInvalidUtf8(bytes);
    let line = 1;
    for (let i = 0; i < at; i++) if (bytes[i] === 0x0a) line++;
    const where = at >= 0 ? ` (the byte at offset ${num(at)}, on line ${num(line)}, is 0x${bytes[at].toString(16).toUpperCase().padStart(2, '0')})` : '';
    throw new FileProblem(
      `The file is not UTF-8 text${where}. It was probably saved as plain "CSV", in an older encoding such as Windows-1252 or Latin-1, so accented letters would be imported wrong. Save it again as "CSV UTF-8 (Comma delimited)" and import that file.`,
    );
  }
}

function readCsv(bytes: Uint8Array): Table {
  let text = decodeUtf8(bytes); // refuses anything but UTF-8 before parsing
  if (text.charCodeAt(0) === 0xfeff) text = text.slice(1); // a byte-order mark from spreadsheet programs
  let header: string[] = [];
  const rows: Table['rows'] = [];
  let record = 0; // the file's row number of the record parsed last (header = 1)
  let dataRows = 0;
  let firstOver = 0;
  let problem: FileProblem | null = null;
  // One record at a time: the file is at most 5 MB; only the first 10,000 data rows are kept.
  Papa.parse<string[]>(text, {
    skipEmptyLines: false,
    step: (result, parser) => {
      record++;
      const cells: Cell[] = result.data;
      const columns = usedColumns(cells);
      if (columns > IMPORT_LIMITS.maxColumns) {
        problem = tooManyColumns(record, columns);
        parser.abort();
        return;
      }
      if (record === 1) {
        header = result.data.map((h) => String(h).trim());
        return;
      }
      if (cells.every(blank)) return;
      dataRows++;
      if (dataRows <= IMPORT_LIMITS.maxRows) rows.push({ row: record, cells });
      else if (!firstOver) firstOver = record;
    },
  });
  if (problem) throw problem;
  if (dataRows > IMPORT_LIMITS.maxRows) {
    throw new FileProblem(
      `The file has ${num(dataRows)} data rows; the limit is ${num(IMPORT_LIMITS.maxRows)} (row ${num(firstOver)} is the first past it). Split it into smaller files.`,
    );
  }
  if (header.every((h) => h === '') && rows.length === 0) throw new FileProblem('The file is empty.');
  return { header, rows };
}

// ---------------------------------------------------------------------------
// XLSX

function cellValue(v: ExcelJS.CellValue): Cell {
  if (v === null || v === undefined) return null;
  if (typeof v === 'number' || typeof v === 'string') return v;
  if (typeof v === 'boolean') return String(v);
  if (v instanceof Date) return v.toISOString();
  if (typeof v === 'object') {
    if ('formula' in v || 'sharedFormula' in v) return { formula: String((v as { formula?: string }).formula ?? '') };
    if ('richText' in v) return v.richText.map((r) => r.text ?? '').join('');
    if ('text' in v) return String(v.text);
    if ('error' in v) return String(v.error);
  }
  return String(v);
}

const unreadable = () => new FileProblem('The file is not a readable XLSX workbook.');
const SHEET_PATH = /^xl\/worksheets\/sheet\d+\.xml$/;
const EMPTY_SHARED_STRINGS = Buffer.from('<?xml version="1.0" encoding="UTF-8"?><sst xmlns="http://schemas.openxmlformats.org/spreadsheetml/2006/main" count="0" uniqueCount="0"/>');

const streamOptions = { sharedStrings: 'cache', worksheets: 'emit', entries: 'emit', styles: 'cache', hyperlinks: 'ignore' } as const;

type BookInfo = { model?: { sheets?: Array<{ rId?: string }> }; workbookRels?: Array<{ Id?: string; Target?: string }> };

/** The path of the workbook's first sheet (in the workbook's order, as the full reader takes it), read by exceljs from workbook.xml and its relationships. */
async function firstSheetPath(bytes: Uint8Array, rels: ZipEntry, book: ZipEntry): Promise<string | undefined> {
  const input = Readable.from(rebuildZip(bytes, [rels, book]), { objectMode: false });
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(input, streamOptions);
  try {
    for await (const _ of reader) break; // no sheet in this archive: reads the two parts
  } finally {
    input.destroy();
  }
  const info = reader as unknown as BookInfo;
  const rId = info.model?.sheets?.[0]?.rId;
  const target = info.workbookRels?.find((r) => r.Id === rId)?.Target;
  if (!target) return undefined;
  return target.startsWith('/') ? target.slice(1) : `xl/${target}`;
}

/**
 * Reads the first sheet of an XLSX workbook without unpacking the whole of it:
 *
 * 1. the archive's table of contents is read and judged (`zip-directory.ts`):
 *    at most 200 parts, 50 MB a part and 100 MB in all as declared, no part
 *    that unpacks over 200 times its packed size, styles of at most 10 MB;
 * 2. the parts read (the workbook, its relationships, the shared strings, the
 *    styles and the first sheet) are inflated once, counting and discarding
 *    the output, and refused if they unpack past their declared size;
 * 3. those parts alone, in the order the reader needs (no temporary files), go
 *    to exceljs's streaming reader, which is stopped at the first row past
 *    10,000 data rows or past 100 columns.
 */
async function readXlsx(bytes: Uint8Array): Promise<Table> {
  const entries = readZipDirectory(bytes);
  checkDeclaredSizes(entries);
  const byName = new Map(entries.map((e) => [e.name, e]));
  const rels = byName.get('xl/_rels/workbook.xml.rels');
  const book = byName.get('xl/workbook.xml');
  if (!rels || !book) throw unreadable();
  await checkInflatedSize(bytes, rels);
  await checkInflatedSize(bytes, book);
  let first: string | undefined;
  try {
    first = await firstSheetPath(bytes, rels, book);
  } catch {
    throw unreadable();
  }
  const sheet = (first && SHEET_PATH.test(first) ? byName.get(first) : undefined) ?? entries.find((e) => SHEET_PATH.test(e.name));
  if (!sheet) throw new FileProblem('The file is empty.');
  const shared = byName.get('xl/sharedStrings.xml');
  const styles = byName.get('xl/styles.xml');
  if (styles && styles.uncompressedSize > IMPORT_LIMITS.xlsxMaxStylesBytes) {
    throw new FileProblem(
      `The workbook part "xl/styles.xml" unpacks to ${(styles.uncompressedSize / 1048576).toFixed(1)} MB; the limit is ${IMPORT_LIMITS.xlsxMaxStylesBytes / 1048576} MB for the styles (Excel's 64,000 cell formats take about 6 MB).`,
    );
  }
  for (const e of [shared, styles, sheet]) if (e) await checkInflatedSize(bytes, e);

  // exceljs streams a sheet only once it has the shared strings (else it parks the sheet in a temporary file): give it an empty table if there is none.
  const parts: ZipPart[] = [rels, book, shared ?? { name: 'xl/sharedStrings.xml', stored: EMPTY_SHARED_STRINGS }, ...(styles ? [styles] : []), sheet];
  const input = Readable.from(rebuildZip(bytes, parts), { objectMode: false });
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(input, streamOptions);

  let header: string[] = [];
  let sawValue = false;
  const rows: Table['rows'] = [];
  let previous = 0;
  try {
    for await (const ws of reader) {
      for await (const r of ws) {
        const n = Number.isInteger(r.number) && r.number > 0 ? r.number : previous + 1; // a row without r="…" follows the one before
        previous = n;
        const vals = r.values as ExcelJS.CellValue[];
        const cells = Array.from({ length: Math.max(0, vals.length - 1) }, (_, i) => cellValue(vals[i + 1]));
        const columns = usedColumns(cells);
        if (columns > IMPORT_LIMITS.maxColumns) throw tooManyColumns(n, columns);
        if (cells.some((c) => c !== null)) sawValue = true;
        if (n === 1) {
          header = cells.map((c) => (c === null ? '' : typeof c === 'object' ? '' : String(c).trim()));
          continue;
        }
        if (cells.every(blank)) continue;
        rows.push({ row: n, cells });
        if (rows.length > IMPORT_LIMITS.maxRows) {
          throw new FileProblem(
            `The sheet has more than ${num(IMPORT_LIMITS.maxRows)} data rows (row ${num(n)} is data row ${num(rows.length)}); the limit is ${num(IMPORT_LIMITS.maxRows)}. Split it into smaller files.`,
          );
        }
      }
      break; // only the first sheet was given to the reader
    }
  } catch (e) {
    if (e instanceof FileProblem) throw e;
    throw unreadable();
  } finally {
    input.destroy();
  }
  if (!sawValue) throw new FileProblem('The file is empty.');
  return { header, rows };
}
