/** Ranking, capital plan and swap schedule, when the case has them: tables of values. */
import type ExcelJS from 'exceljs';
import { printSetup, setText, styleHeader, styleTitle } from './cells';
import type { PlanTable } from './types';

export const PLAN_SHEET = 'Plan';

export function addPlanSheet(wb: ExcelJS.Workbook, tables: PlanTable[]): void {
  const ws = wb.addWorksheet(PLAN_SHEET, printSetup());
  // widths first (a streamed sheet writes them before its rows): the widest asked for in each column
  const widths: number[] = [];
  for (const t of tables) t.columns.forEach((c, i) => (widths[i] = Math.max(widths[i] ?? 10, c.width ?? 14)));
  widths.forEach((w, i) => (ws.getColumn(i + 1).width = w));
  ws.getCell('A1').value = 'Ranking and capital plan';
  styleTitle(ws.getCell('A1'));
  let r = 3;
  for (const t of tables) {
    ws.getCell(r, 1).value = t.title;
    ws.getCell(r, 1).font = { bold: true, size: 12 };
    r++;
    const h = ws.getRow(r);
    h.values = t.columns.map((c) => c.header);
    styleHeader(h);
    r++;
    for (const row of t.rows) {
      row.forEach((v, i) => {
        const cell = ws.getCell(r, i + 1);
        if (typeof v === 'string') setText(cell, v);
        else cell.value = v;
        const fmt = t.columns[i]?.format;
        if (fmt && typeof v === 'number') cell.numFmt = fmt;
      });
      ws.getRow(r).commit();
      r++;
    }
    r++;
  }
  ws.commit();
}
