/**
 * The case workbook (issue 6): cover, summary, assumptions with defined
 * names, depreciation shares, the engine/offer/truck tables, one sheet per
 * truck with live formulas, the plan when there is one, and the IRR grid.
 * Server-side only: exceljs in, a stream of XLSX bytes out.
 *
 * Written with exceljs's streaming writer (issue 18): each sheet is written
 * top to bottom, its rows committed as they are done, and the next sheet
 * waits until the one before last has gone through the zip, so memory holds
 * a sheet or two, whatever the size of the fleet. The Summary, second in the
 * workbook, refers to cells of truck sheets written after it: where they
 * will be comes from the layout alone (`truckSheetRefs`), and each truck
 * sheet checks that it put its figures there.
 */
import { PassThrough, type Writable } from 'node:stream';
import ExcelJS from 'exceljs';
import { xmlEncode } from 'exceljs/lib/utils/utils';
import WorkbookXform from 'exceljs/lib/xlsx/xform/book/workbook-xform';
import { evaluateCaseDetailed } from '@/lib/engine/evaluate';
import type { CaseFile } from '@/lib/validation/case';
import { addAssumptionsSheet, ASSUMPTIONS_SHEET } from './sheet-assumptions';
import { addCoverSheet, COVER_SHEET } from './sheet-cover';
import { addDepreciationSheet, DEPRECIATION_SHEET } from './sheet-depreciation';
import { addIrrGridSheet, IRR_GRID_SHEET, irrGridRefs } from './sheet-irr-grid';
import { addLibrarySheets, ENGINES_SHEET, OFFERS_SHEET, TRUCKS_SHEET } from './sheet-library';
import { addPlanSheet, PLAN_SHEET } from './sheet-plan';
import { addSummarySheet, SUMMARY_SHEET } from './sheet-summary';
import { addTruckSheet, truckSheetName, truckSheetRefs } from './sheet-truck';
import type { WorkbookInput, WorkbookMeta } from './types';


/** A cell as exceljs holds it (the parts the row writer reads). */
interface CellInternals {
  address: string;
  col: number;
  style: Partial<ExcelJS.Style>;
  _comment?: unknown;
  _value: { model: { type: number; value?: unknown; formula?: string; sharedFormula?: string; shareType?: string; si?: number; result?: unknown } };
}

/** A row as exceljs holds it. */
interface RowInternals {
  number: number;
  height?: number;
  hidden?: boolean;
  outlineLevel?: number;
  style: Partial<ExcelJS.Style>;
  _cells: (CellInternals | undefined)[];
}

/** The streamed sheet's own row writer and what it needs. */
interface SheetInternals {
  _writeRow(row: RowInternals): void;
  _writeColumns(): void;
  _writeOpenSheetData(): void;
  startedData: boolean;
  stream: { write(text: string): void };
}

// exceljs's value types (Enums.ValueType): the ones the row writer handles itself
const NULL = 0;
const NUMBER = 2;
const STRING = 3;
const FORMULA = 6;

/** What the streaming writer keeps to itself and this file reads. */
interface WriterInternals {
  styles: { addStyleModel(style: Partial<ExcelJS.Style>, cellType?: number): number };
  sharedStrings: { add(text: string): number };
  zip: {
    append(source: string | Buffer, data: { name: string }): void;
    on(event: 'entry', listener: (entry: { name: string }) => void): void;
    on(event: 'error', listener: (err: Error) => void): void;
  };
  _worksheets: ({ id: number; committed: boolean; settled?: boolean; _formulae: Record<string, unknown> } | undefined)[];
  _definedNames: { model: unknown };
  views: unknown[];
}

/**
 * exceljs's streaming writer with two things added: the calculation
 * properties the in-memory writer wrote (full recalculation on load; the
 * streaming one writes none), and `settle`, which waits until every sheet
 * committed but the last has gone through the zip.
 */
class StreamedWorkbook extends ExcelJS.stream.xlsx.WorkbookWriter {
  private readonly pending = new Set<string>();
  private waiters: { limit: number; resolve: () => void; reject: (err: Error) => void }[] = [];
  private failed: Error | null = null;

  constructor(
    out: Writable,
    private readonly exceljsRows = false,
  ) {
    super({ stream: out, useStyles: true, useSharedStrings: true });
    const zip = this.internals.zip;
    zip.on('entry', (entry) => {
      this.pending.delete(entry.name.replace(/^\/+/, ''));
      this.wake();
    });
    zip.on('error', (err) => {
      this.failed = err;
      this.wake();
    });
  }

  private get internals(): WriterInternals {
    return this as unknown as WriterInternals;
  }

  private wake(): void {
    this.waiters = this.waiters.filter((w) => {
      if (this.failed) w.reject(this.failed);
      else if (this.pending.size <= w.limit) w.resolve();
      else return true;
      return false;
    });
  }

  /** Wait until at most `limit` committed sheets are still on their way into the zip. */
  async settle(limit = 1): Promise<void> {
    for (const ws of this.internals._worksheets) {
      if (ws?.committed && !ws.settled) {
        ws.settled = true;
        // the writer keeps every formula cell of a sheet (for shared formulas, which these sheets have none of)
        // as long as the workbook: let a written sheet's go
        ws._formulae = {};
        this.pending.add(`xl/worksheets/sheet${ws.id}.xml`);
      }
    }
    if (this.failed) throw this.failed;
    if (this.pending.size <= limit) return;
    await new Promise<void>((resolve, reject) => this.waiters.push({ limit, resolve, reject }));
  }

  /**
   * Each cell has a style object of its own, and the writer turns a style it
   * has not met (by identity) into its XML parts to find its number: most of
   * the time of a sheet. Just before a row is written, cells of equal style
   * are given one shared object, so that work is done once per style.
   */
  override addWorksheet(name?: string, options?: Partial<ExcelJS.AddWorksheetOptions>): ExcelJS.Worksheet {
    const ws = super.addWorksheet(name, options);
    const sheet = ws as unknown as SheetInternals;
    const writeRow = sheet._writeRow.bind(ws);
    sheet._writeRow = (row) => {
      row.style = this.intern(row.style);
      for (const cell of row._cells) if (cell) cell.style = this.intern(cell.style);
      const xml = this.exceljsRows ? null : this.rowXml(row);
      if (xml === null) return writeRow(row);
      if (!sheet.startedData) {
        sheet._writeColumns();
        sheet._writeOpenSheetData();
        sheet.startedData = true;
      }
      if (xml) sheet.stream.write(xml);
    };
    return ws;
  }

  /**
   * A row's XML as exceljs's RowXform and CellXform write it (same
   * attributes in the same order, the same style and shared-string numbers
   * asked in the same order), for rows of plain cells: empty, number, text
   * and formula cells with a number or text result — every row of this
   * workbook but the Cover's merged ones. `null`: let exceljs write the row;
   * '': nothing to write (exceljs writes a row only when it has a value or a
   * height).
   */
  private rowXml(row: RowInternals): string | null {
    if (row.hidden || row.outlineLevel) return null;
    const { styles, sharedStrings } = this.internals;
    for (const cell of row._cells) {
      if (!cell) continue;
      const m = cell._value.model;
      if (cell._comment || (m.type !== NULL && m.type !== NUMBER && m.type !== STRING && m.type !== FORMULA)) return null;
      if (m.type === FORMULA && (m.sharedFormula || m.shareType || m.si !== undefined || !m.formula)) return null;
      if (m.type === FORMULA && m.result != null && typeof m.result !== 'number' && typeof m.result !== 'string') return null;
    }
    let min = 0;
    let max = 0;
    let hasValues = false;
    for (const cell of row._cells) {
      if (!cell) continue;
      if (!min || min > cell.col) min = cell.col;
      if (max < cell.col) max = cell.col;
      if (cell._value.model.type !== NULL) hasValues = true;
    }
    if (!hasValues && !row.height) return '';
    const rowStyle = styles.addStyleModel(row.style);
    let cells = '';
    for (const cell of row._cells) {
      if (!cell) continue;
      const m = cell._value.model;
      let type = m.type;
      let t = '';
      let body = '';
      if (type === NUMBER) body = `<v>${xmlEncode(String(m.value))}</v>`;
      else if (type === FORMULA) {
        const f = `<f>${xmlEncode(m.formula as string)}</f>`;
        if (m.result == null) {
          type = NULL;
          body = f;
        } else if (typeof m.result === 'number') {
          type = NUMBER;
          body = `${f}<v>${xmlEncode(String(m.result))}</v>`;
        } else {
          type = STRING;
          t = 'str'; // formula results never use shared strings
          body = `${f}<v>${xmlEncode(m.result as string)}</v>`;
        }
      }
      const s = styles.addStyleModel(cell.style || {}, type);
      if (m.type === STRING) {
        t = 's';
        body = `<v>${sharedStrings.add(m.value as string)}</v>`;
      }
      if (m.type === NULL && !s) continue;
      cells += `<c r="${xmlEncode(cell.address)}"${s ? ` s="${s}"` : ''}${t ? ` t="${t}"` : ''}${body ? `>${body}</c>` : '/>'}`;
    }
    const attrs =
      `<row r="${row.number}"` +
      (row.height ? ` ht="${xmlEncode(String(row.height))}" customHeight="1"` : '') +
      (min > 0 && max > 0 && min <= max ? ` spans="${min}:${max}"` : '') +
      (rowStyle ? ` s="${rowStyle}" customFormat="1"` : '') +
      ' x14ac:dyDescent="0.25"';
    return cells ? `${attrs}>${cells}</row>` : `${attrs}/>`;
  }

  private readonly interned = new Map<string, Partial<ExcelJS.Style>>();

  /** One object per distinct style (a style of a number format alone, the most common, is keyed without JSON). */
  private intern(style: Partial<ExcelJS.Style>): Partial<ExcelJS.Style> {
    const plain = !style.font && !style.border && !style.fill && !style.alignment && !style.protection;
    const key = plain ? `#${style.numFmt ?? ''}` : JSON.stringify(style);
    const known = this.interned.get(key);
    if (known) return known;
    this.interned.set(key, style);
    return style;
  }

  /**
   * The first thing the writer adds to the zip (from its constructor): the
   * moment to make every text entry a Buffer before archiver sees it.
   * archiver turns text with the deprecated `new Buffer(text)`, and Node
   * warns about that once per thread when the call is not under
   * node_modules — as in the worker bundle, which would log it at every export.
   */
  override addThemes(): Promise<void> {
    const zip = this.internals.zip as WriterInternals['zip'] & { buffered?: boolean };
    if (!zip.buffered) {
      zip.buffered = true;
      const append = zip.append.bind(zip);
      zip.append = (source, data) => append(typeof source === 'string' ? Buffer.from(source) : source, data);
    }
    return super.addThemes();
  }

  override async addWorkbook(): Promise<void> {
    const w = this.internals;
    const model = {
      worksheets: w._worksheets.filter(Boolean),
      definedNames: w._definedNames.model,
      views: w.views,
      properties: {},
      calcProperties: this.calcProperties,
    };
    const xform = new WorkbookXform();
    xform.prepare(model);
    w.zip.append(xform.toXml(model), { name: '/xl/workbook.xml' });
  }
}

/** Sheet names other than the trucks', lower case (a truck sheet takes none of them). */
const FIXED_SHEETS = [COVER_SHEET, SUMMARY_SHEET, ASSUMPTIONS_SHEET, DEPRECIATION_SHEET, ENGINES_SHEET, OFFERS_SHEET, TRUCKS_SHEET, PLAN_SHEET, IRR_GRID_SHEET];

/**
 * Writes the workbook of an evaluated case to `out` (ended when the
 * workbook is complete). `exceljsRows`: every row through exceljs's own
 * serialisers (the test that proves the row writer writes what they write).
 */
export async function writeWorkbook({ caseFile: c, evaluated, meta }: WorkbookInput, out: Writable, options: { exceljsRows?: boolean } = {}): Promise<void> {
  const wb = new StreamedWorkbook(out, options.exceljsRows);
  wb.creator = 'Haulcase';
  wb.lastModifiedBy = 'Unknown';
  wb.created = meta.generatedAt ?? new Date();
  wb.modified = new Date();
  wb.title = c.name;
  // a program that honours this recomputes on open instead of trusting cached values
  wb.calcProperties = { fullCalcOnLoad: true };
  const { result, details } = evaluated;
  const maxN = Math.max(...result.trucks.map((t) => t.horizonYears));
  const taken = new Set<string>(FIXED_SHEETS.map((s) => s.toLowerCase()));
  const names = c.trucks.map((t, i) => truckSheetName(i, t.id, taken));
  const refs = result.trucks.map((t, i) => truckSheetRefs(names[i], t.horizonYears));

  addCoverSheet(wb, c, meta);
  addSummarySheet(wb, result, refs, c.currency);
  await wb.settle();
  addAssumptionsSheet(wb, c);
  const dep = addDepreciationSheet(wb, maxN + 1);
  const lib = addLibrarySheets(wb, c, details, meta);
  await wb.settle();
  const horizons = result.trucks.map((t) => t.horizonYears);
  const grid = irrGridRefs(maxN, horizons);
  for (let i = 0; i < c.trucks.length; i++) {
    const written = addTruckSheet(wb, names[i], c, c.trucks[i], details[i], result.trucks[i], lib, dep, grid);
    if (JSON.stringify(written) !== JSON.stringify(refs[i])) throw new Error(`workbook layout: sheet ${names[i]} moved the figures the Summary reads`);
    await wb.settle();
  }
  if (meta.plan && meta.plan.length) addPlanSheet(wb, meta.plan);
  addIrrGridSheet(wb, maxN, horizons);
  await wb.commit();
}

/** The workbook of an evaluated case in memory (tests, the CLI); the server streams it (`writeWorkbook`). */
export async function writeWorkbookBuffer(input: WorkbookInput, options: { exceljsRows?: boolean } = {}): Promise<Buffer> {
  const out = new PassThrough();
  const chunks: Buffer[] = [];
  out.on('data', (chunk: Buffer) => chunks.push(chunk));
  const ended = new Promise<void>((resolve, reject) => {
    out.on('end', resolve);
    out.on('error', reject);
  });
  await writeWorkbook(input, out, options);
  await ended;
  return Buffer.concat(chunks);
}

/** Evaluate a validated case and write its workbook. */
export async function writeCaseWorkbook(c: CaseFile, meta: WorkbookMeta = {}): Promise<Buffer> {
  return writeWorkbookBuffer({ caseFile: c, evaluated: evaluateCaseDetailed(c, { trusted: true }), meta });
}
