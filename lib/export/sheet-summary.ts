/**
 * The Summary sheet: one row per truck, every figure a formula on that
 * truck's sheet, and fleet totals. The same rows, as values, are the CSV.
 */
import type ExcelJS from 'exceljs';
import type { CaseResult } from '@/lib/engine/types';
import { FMT, addr, printSetup, setFormula, setText, setWidths, sheetRef, styleHeader, styleTitle } from './cells';
import type { TruckSheetRefs } from './sheet-truck';

export const SUMMARY_SHEET = 'Summary';

export function summaryHeaders(currency: string): string[] {
  return [
    'Unit', 'Horizon (years)', `NPV keep (${currency})`, `NPV rebuild (${currency})`, `NPV repower (${currency})`, 'Best policy',
    `Best NPV (${currency})`, `ΔNPV repower vs rebuild (${currency})`, `ΔNPV repower vs keep (${currency})`,
    'IRR repower vs rebuild', 'MIRR repower vs rebuild', 'Payback repower vs rebuild (years)',
    'Discounted payback repower vs rebuild (years)', `Repower capital, undiscounted (${currency})`,
  ];
}

const FORMATS = [FMT.count, FMT.money, FMT.money, FMT.money, undefined, FMT.money, FMT.money, FMT.money, FMT.rate, FMT.rate, FMT.years, FMT.years, FMT.money];

/** Second, for reading order, before the truck sheets it refers to (`refs`: where those sheets will put each figure). */
export function addSummarySheet(wb: ExcelJS.Workbook, result: CaseResult, refs: TruckSheetRefs[], currency: string): void {
  const ws = wb.addWorksheet(SUMMARY_SHEET, { views: [{ state: 'frozen', ySplit: 4, xSplit: 1 }], ...printSetup('4:4') });
  setWidths(ws, [14, 10, 15, 15, 15, 11, 15, 15, 15, 11, 11, 12, 12, 15, 22]);
  styleTitle(ws.getCell('A1'));
  ws.getCell('A1').value = 'Summary by truck';
  ws.getCell('A2').value = 'NPV is negative for a cost. Each figure is a formula on the truck sheet named beside it; "n/a" where the figure does not exist (see Cover).';
  const header = ws.getRow(4);
  header.values = [...summaryHeaders(currency), 'Sheet'];
  header.height = 44;
  styleHeader(header);
  const first = 5;
  result.trucks.forEach((t, i) => {
    const r = first + i;
    const ref = refs[i];
    const s = sheetRef(ref.sheet);
    const rvr = ref.comparisons.repowerVsRebuild;
    const capital = -t.options.repower.breakdown.reduce((sum, b) => sum + b.capital, 0);
    setText(ws.getCell(r, 1), t.id);
    const cells: [string, number | string][] = [
      [`${s}$E$3`, t.horizonYears],
      [`${s}${ref.blocks.keep.npv}`, t.options.keep.npv],
      [`${s}${ref.blocks.rebuild.npv}`, t.options.rebuild.npv],
      [`${s}${ref.blocks.repower.npv}`, t.options.repower.npv],
      // ties within 1e-6 go to rebuild, then keep, then repower (MODEL.md section 8)
      [`IF(D${r}>MAX(C${r}:E${r})-0.000001,"rebuild",IF(C${r}>MAX(C${r}:E${r})-0.000001,"keep","repower"))`, t.best],
      [`MAX(C${r}:E${r})`, t.options[t.best].npv],
      [`${s}${rvr.deltaNpv}`, t.repowerVsRebuild.deltaNpv],
      [`${s}${ref.comparisons.repowerVsKeep.deltaNpv}`, t.repowerVsKeep.deltaNpv],
      [`${s}${rvr.irr}`, t.repowerVsRebuild.irr ?? 'n/a'],
      [`${s}${rvr.mirr}`, t.repowerVsRebuild.mirr ?? 'n/a'],
      [`${s}${rvr.payback}`, t.repowerVsRebuild.paybackYears ?? 'n/a'],
      [`${s}${rvr.discountedPayback}`, t.repowerVsRebuild.discountedPaybackYears ?? 'n/a'],
      [`${s}${ref.blocks.repower.capital}`, capital],
    ];
    cells.forEach(([formula, value], k) => {
      const cell = ws.getCell(r, 2 + k);
      setFormula(cell, formula, value);
      if (FORMATS[k]) cell.numFmt = FORMATS[k] as string;
      cell.alignment = { horizontal: 'right' };
    });
    ws.getCell(r, 15).value = ref.sheet;
    ws.getRow(r).commit();
  });
  const last = first + result.trucks.length - 1;
  const total = last + 1;
  ws.getCell(total, 1).value = 'Fleet';
  const f = result.fleet;
  const sumOf = (pick: (t: CaseResult['trucks'][number]) => number) => result.trucks.reduce((s, t) => s + pick(t), 0);
  const sums: [number, number][] = [
    [3, f.npv.keep], [4, f.npv.rebuild], [5, f.npv.repower], [7, f.npv.best],
    [8, sumOf((t) => t.repowerVsRebuild.deltaNpv)], [9, sumOf((t) => t.repowerVsKeep.deltaNpv)], [14, f.capital.repower],
  ];
  for (const [col, value] of sums) {
    const cell = ws.getCell(total, col);
    setFormula(cell, `SUM(${addr(first, col)}:${addr(last, col)})`, value);
    cell.numFmt = FMT.money;
  }
  ws.getRow(total).font = { bold: true };
  ws.getRow(total).eachCell((c) => (c.border = { top: { style: 'thin' } }));
  ws.commit();
}
