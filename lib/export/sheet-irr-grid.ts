/**
 * The IRR grid of MODEL.md section 8: rates (k − 990)/1000 for k = 0..10990,
 * and the years 0..N as a row. Each comparison counts the roots of
 * Σ ΔCF_y/(1+i)^y on this grid by formula, so "exactly one rate" — the rule
 * that decides whether an IRR is shown — is live too.
 */
import type ExcelJS from 'exceljs';
import { colLetter, sheetRef } from './cells';

export const IRR_GRID_SHEET = 'IRR grid';
const STEPS = 10991;

export interface IrrGridRefs {
  /** rates of steps 0..10989, 1..10990 and 0..10990 */
  lo: string;
  hi: string;
  all: string;
  /** the row 0..n of years */
  years(n: number): string;
}

/** The grid's ranges: fixed, so truck sheets can refer to them before the grid sheet is added (it goes last). */
export function irrGridRefs(): IrrGridRefs {
  const s = sheetRef(IRR_GRID_SHEET);
  return {
    lo: `${s}$A$2:$A$${STEPS}`,
    hi: `${s}$A$3:$A$${STEPS + 1}`,
    all: `${s}$A$2:$A$${STEPS + 1}`,
    years: (n) => `${s}$C$1:$${colLetter(3 + n)}$1`,
  };
}

export function addIrrGridSheet(wb: ExcelJS.Workbook, maxYears: number): void {
  const ws = wb.addWorksheet(IRR_GRID_SHEET);
  ws.getCell('A1').value = 'Rate';
  ws.getCell('B1').value = 'Years →';
  for (let y = 0; y <= maxYears; y++) ws.getCell(1, 3 + y).value = y;
  for (let k = 0; k < STEPS; k++) {
    const c = ws.getCell(k + 2, 1);
    c.value = (k - 990) / 1000;
    c.numFmt = '0.0%';
  }
  ws.getCell('B3').value = 'IRR roots are counted where Σ ΔCF/(1+i)^y changes sign between neighbouring rates of this grid, or is exactly 0 at one.';
}
