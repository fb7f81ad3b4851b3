/**
 * Small helpers shared by the workbook sheets: A1 addresses, sheet-name
 * quoting, formula cells, inert text cells and the house number formats.
 *
 * The workbook is written by exceljs's streaming writer (workbook.ts): a
 * sheet's views and page set-up go with `addWorksheet`, its column widths
 * before its first row is committed, and a committed row cannot be touched
 * again, so each sheet writes its rows top to bottom.
 */
import type ExcelJS from 'exceljs';

const letters: string[] = [];

/** 1 → A, 27 → AA. */
export function colLetter(col: number): string {
  const known = letters[col];
  if (known !== undefined) return known;
  let s = '';
  for (let n = col; n > 0; n = Math.floor((n - 1) / 26)) s = String.fromCharCode(65 + ((n - 1) % 26)) + s;
  if (col < 1024) letters[col] = s;
  return s;
}

export function addr(row: number, col: number, absolute = false): string {
  return absolute ? `$${colLetter(col)}$${row}` : `${colLetter(col)}${row}`;
}

/** `'Sheet name'!` — always quoted, so any sheet name is safe in a formula. */
export function sheetRef(name: string): string {
  return `'${name.replace(/'/g, "''")}'!`;
}

/** A reference to a cell of another sheet, absolute. */
export function xref(sheet: string, row: number, col: number): string {
  return `${sheetRef(sheet)}${addr(row, col, true)}`;
}

/**
 * A live formula. The cached result is the engine's figure, so a program that
 * shows cached values (or a preview) is right before it recomputes.
 */
export function setFormula(cell: ExcelJS.Cell, formula: string, result?: number | string): void {
  cell.value = result === undefined ? { formula } : ({ formula, result } as ExcelJS.CellFormulaValue);
}

/**
 * Text a person typed (unit numbers, names, notes): always a plain string
 * cell, never a formula, whatever it starts with (= + - @). A string cell is
 * stored as a shared string and no spreadsheet evaluates it.
 */
export function setText(cell: ExcelJS.Cell, text: string | null | undefined): void {
  cell.value = text == null ? '' : String(text);
  cell.numFmt = '@';
}

export const FMT = {
  money: '#,##0;(#,##0);-',
  money2: '#,##0.00;(#,##0.00);-',
  price: '#,##0.0000',
  rate: '0.00%',
  rate4: '0.0000%',
  index: '0.000000',
  hours: '#,##0',
  qty: '#,##0.0',
  qty2: '#,##0.00',
  count: '0',
  years: '0.00',
  factor: '0.000000',
} as const;

/** Header row look: bold, ruled underneath, wrapped. */
export function styleHeader(row: ExcelJS.Row): void {
  row.font = { bold: true, color: { argb: 'FF15181C' } };
  row.alignment = { vertical: 'bottom', wrapText: true };
  row.eachCell((c) => {
    c.border = { bottom: { style: 'thin', color: { argb: 'FF5D646D' } } };
    c.fill = { type: 'pattern', pattern: 'solid', fgColor: { argb: 'FFF7F7F5' } };
  });
}

export function styleTitle(cell: ExcelJS.Cell, size = 14): void {
  cell.font = { bold: true, size, color: { argb: 'FF15181C' } };
}

/**
 * Landscape, fit to one page wide, repeating the given header rows: options
 * for `addWorksheet`, because a streamed sheet writes its page set-up flag
 * (fit to page) the moment it is added.
 */
export function printSetup(repeatRows?: string): Pick<Partial<ExcelJS.AddWorksheetOptions>, 'pageSetup' | 'headerFooter'> {
  return {
    pageSetup: {
      orientation: 'landscape',
      fitToPage: true,
      fitToWidth: 1,
      fitToHeight: 0,
      paperSize: 9,
      margins: { left: 0.4, right: 0.4, top: 0.5, bottom: 0.5, header: 0.3, footer: 0.3 },
      printTitlesRow: repeatRows,
    },
    headerFooter: { oddFooter: '&L&A&RPage &P of &N' },
  };
}

/**
 * Column widths: before the sheet's first row is committed (a streamed
 * sheet writes its columns ahead of the rows).
 */
export function setWidths(ws: ExcelJS.Worksheet, widths: number[]): void {
  widths.forEach((w, i) => (ws.getColumn(i + 1).width = w));
}
