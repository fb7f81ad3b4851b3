/**
 * The Depreciation sheet: the share of a spend depreciated in the j-th year of
 * its schedule under the method on the Assumptions sheet, its running total
 * and the share left (written off when the horizon ends first). MACRS shares
 * are the percentages printed in IRS Publication 946, Table A-1 (GDS,
 * half-year convention); the other methods are formulas on DepYears and
 * DepFactor, so changing the method recomputes every tax shield.
 */
import type ExcelJS from 'exceljs';
import { MACRS_HALF_YEAR_PERCENT } from '@/lib/engine/depreciation';
import { FMT, addr, printSetup, setFormula, setWidths, styleHeader, styleTitle, xref } from './cells';

export const DEPRECIATION_SHEET = 'Depreciation';
const FIRST_ROW = 5;
const CLASSES = [3, 5, 7, 10, 15, 20] as const;
const COL = { j: 1, macrs0: 2, sl: 8, dbBasis: 9, db: 10, share: 11, cum: 12, left: 13 } as const;

export interface DepreciationRefs {
  /** absolute reference to the share depreciated in year j of a schedule (j ≥ 1) */
  share(j: number): string;
  /** share of the spend not yet depreciated after j years (0 under "none") */
  left(j: number): string;
}

/** `rows`: how many schedule years to lay out (the longest horizon at least). */
export function addDepreciationSheet(wb: ExcelJS.Workbook, rows: number): DepreciationRefs {
  const ws = wb.addWorksheet(DEPRECIATION_SHEET, { views: [{ state: 'frozen', ySplit: 4, xSplit: 1 }], ...printSetup('4:4') });
  setWidths(ws, [10, 11, 11, 11, 11, 11, 11, 13, 16, 14, 13, 13, 16]);
  const n = Math.max(rows, 21);
  styleTitle(ws.getCell('A1'));
  ws.getCell('A1').value = 'Depreciation shares by year of schedule';
  ws.getCell('A2').value =
    'MACRS: IRS Publication 946, Table A-1 (GDS, half-year convention), percentages as printed. The year-j share of a spend in period s falls in year max(s,1)+j−1; what is left at the end of the horizon is written off then.';
  CLASSES.forEach((cls, i) => (ws.getCell(3, COL.macrs0 + i).value = cls));
  ws.getCell(3, 1).value = 'class (years) →';
  const header = ws.getRow(4);
  header.values = [
    'Year j', ...CLASSES.map((c) => `MACRS ${c}-yr (%)`), 'Straight line', 'Declining balance: basis left', 'Declining balance',
    'Share applied', 'Cumulative', 'Left (write-off share)',
  ];
  styleHeader(header);

  for (let j = 1; j <= n; j++) {
    const r = FIRST_ROW + j - 1;
    ws.getCell(r, COL.j).value = j;
    CLASSES.forEach((cls, i) => {
      const pct = MACRS_HALF_YEAR_PERCENT[cls][j - 1];
      if (pct !== undefined) ws.getCell(r, COL.macrs0 + i).value = pct;
    });
    const jj = addr(r, COL.j);
    setFormula(ws.getCell(r, COL.sl), `IF(${jj}<=DepYears,1/DepYears,0)`);
    setFormula(ws.getCell(r, COL.dbBasis), j === 1 ? '1' : `${addr(r - 1, COL.dbBasis)}-${addr(r - 1, COL.db)}`);
    const b = addr(r, COL.dbBasis);
    setFormula(ws.getCell(r, COL.db), `IF(${jj}<=DepYears,MAX(${b}*DepFactor/DepYears,${b}/(DepYears-${jj}+1)),0)`);
    const macrsRow = `${addr(r, COL.macrs0)}:${addr(r, COL.macrs0 + CLASSES.length - 1)}`;
    const macrsHdr = `${addr(3, COL.macrs0, true)}:${addr(3, COL.macrs0 + CLASSES.length - 1, true)}`;
    setFormula(
      ws.getCell(r, COL.share),
      `IF(DepMethod="none",0,IF(DepMethod="straight-line",${addr(r, COL.sl)},IF(DepMethod="declining-balance",${addr(r, COL.db)},IFERROR(INDEX(${macrsRow},1,MATCH(DepYears,${macrsHdr},0))/100,0))))`,
    );
    setFormula(ws.getCell(r, COL.cum), `SUM(${addr(FIRST_ROW, COL.share, true)}:${addr(r, COL.share)})`);
    setFormula(ws.getCell(r, COL.left), `IF(DepMethod="none",0,1-${addr(r, COL.cum)})`);
    for (const c of [COL.sl, COL.dbBasis, COL.db, COL.share, COL.cum, COL.left]) ws.getCell(r, c).numFmt = FMT.factor;
  }
  ws.commit();
  return {
    share: (j) => xref(DEPRECIATION_SHEET, FIRST_ROW + j - 1, COL.share),
    left: (j) => xref(DEPRECIATION_SHEET, FIRST_ROW + j - 1, COL.left),
  };
}
