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


/** What the streaming writer keeps to itself and this file reads. */
interface WriterInternals {
  zip: {
    append(source: string, data: { name: string }): void;
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

  constructor(out: Writable) {
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
    const ws = super.addWorksheet(name, options) as ExcelJS.Worksheet & { _writeRow(row: ExcelJS.Row): void };
    const writeRow = ws._writeRow.bind(ws);
    ws._writeRow = (row) => {
      row.eachCell((cell) => {
        const key = JSON.stringify(cell.style);
        const known = this.interned.get(key);
        if (known) cell.style = known;
        else this.interned.set(key, cell.style);
      });
      writeRow(row);
    };
    return ws;
  }

  private readonly interned = new Map<string, Partial<ExcelJS.Style>>();

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

/** Writes the workbook of an evaluated case to `out` (ended when the workbook is complete). */
export async function writeWorkbook({ caseFile: c, evaluated, meta }: WorkbookInput, out: Writable): Promise<void> {
  const wb = new StreamedWorkbook(out);
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
export async function writeWorkbookBuffer(input: WorkbookInput): Promise<Buffer> {
  const out = new PassThrough();
  const chunks: Buffer[] = [];
  out.on('data', (chunk: Buffer) => chunks.push(chunk));
  const ended = new Promise<void>((resolve, reject) => {
    out.on('end', resolve);
    out.on('error', reject);
  });
  await writeWorkbook(input, out);
  await ended;
  return Buffer.concat(chunks);
}

/** Evaluate a validated case and write its workbook. */
export async function writeCaseWorkbook(c: CaseFile, meta: WorkbookMeta = {}): Promise<Buffer> {
  return writeWorkbookBuffer({ caseFile: c, evaluated: evaluateCaseDetailed(c, { trusted: true }), meta });
}
