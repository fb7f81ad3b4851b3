/**
 * The comparisons of a truck sheet (MODEL.md section 8): ΔCF of repower vs
 * rebuild, repower vs keep and rebuild vs keep by year with the running
 * figures payback needs, then ΔNPV, IRR, MIRR, payback, discounted payback
 * and PI as formulas. IRR is shown only when the grid holds exactly one root
 * and the first flow that is not zero is an investment; "n/a" otherwise,
 * as for MIRR without a positive or a negative flow and a payback never reached.
 */
import type ExcelJS from 'exceljs';
import type { Comparison, TruckResult } from '@/lib/engine/types';
import { FMT, addr, setFormula, styleHeader } from './cells';
import { C, type BlockRefs } from './policy-block';
import { pieceTest, type IrrGridRefs } from './sheet-irr-grid';

export const COMPARISONS = [
  { key: 'repowerVsRebuild', first: 'repower', second: 'rebuild', label: 'Repower vs rebuild' },
  { key: 'repowerVsKeep', first: 'repower', second: 'keep', label: 'Repower vs keep' },
  { key: 'rebuildVsKeep', first: 'rebuild', second: 'keep', label: 'Rebuild vs keep' },
] as const;
export type ComparisonKey = (typeof COMPARISONS)[number]['key'];

const K = { d: 0, dd: 1, sign: 2, first: 3, last: 4, change: 5, t: 6, cum: 7, cumD: 8, pb: 9, dpb: 10 } as const;
const WIDTH = 11;
const EPS = '0.000001';

export interface ComparisonRefs {
  deltaNpv: string;
  irr: string;
  mirr: string;
  payback: string;
  discountedPayback: string;
  profitabilityIndex: string;
}

const na = (v: number | null) => (v === null ? 'n/a' : v);

/** The row of comparison k's results for horizon n when the section starts at `startRow`. */
function resultRow(startRow: number, n: number, k: number): number {
  return startRow + 3 + n + 2 + 1 + k;
}

/** Where the section starting at `startRow` puts each comparison's results (the Summary refers to them before the truck sheet is written). */
export function comparisonRefs(startRow: number, n: number): Record<ComparisonKey, ComparisonRefs> {
  const out = {} as Record<ComparisonKey, ComparisonRefs>;
  COMPARISONS.forEach((cmp, k) => {
    const r = resultRow(startRow, n, k);
    out[cmp.key] = {
      deltaNpv: addr(r, 2, true),
      irr: addr(r, 3, true),
      mirr: addr(r, 6, true),
      payback: addr(r, 7, true),
      discountedPayback: addr(r, 8, true),
      profitabilityIndex: addr(r, 9, true),
    };
  });
  return out;
}

export function writeComparisons(
  ws: ExcelJS.Worksheet,
  result: TruckResult,
  blocks: Record<'keep' | 'rebuild' | 'repower', BlockRefs>,
  grid: IrrGridRefs,
  startRow: number,
): Record<ComparisonKey, ComparisonRefs> {
  const n = result.horizonYears;
  ws.getCell(startRow, 1).value = 'Comparisons: ΔCF = cash flow of the first policy − the second';
  ws.getCell(startRow, 1).font = { bold: true, size: 12 };
  const labels = ['ΔCF', 'ΔCF × DF', 'Sign', 'Sign of first flow', 'Last sign', 'Sign change', 'Years since first flow', 'Running ΔCF', 'Running ΔCF × DF', 'Payback here', 'Disc. payback here'];
  const h1 = ws.getRow(startRow + 1);
  const h2 = ws.getRow(startRow + 2);
  h2.getCell(1).value = 'Year';
  COMPARISONS.forEach((cmp, k) => {
    h1.getCell(2 + k * WIDTH).value = cmp.label;
    labels.forEach((l, i) => (h2.getCell(2 + k * WIDTH + i).value = l));
  });
  h1.font = { bold: true };
  styleHeader(h2);
  const first = startRow + 3;
  const last = first + n;

  COMPARISONS.forEach((cmp, k) => {
    const col = (j: number) => 2 + k * WIDTH + j;
    const a = blocks[cmp.first];
    const b = blocks[cmp.second];
    const A = result.options[cmp.first].cashFlows;
    const B = result.options[cmp.second].cashFlows;
    for (let y = 0; y <= n; y++) {
      const r = first + y;
      const at = (j: number) => addr(r, col(j));
      const prev = (j: number) => addr(r - 1, col(j));
      const line = ws.getRow(r);
      const f = (j: number, formula: string, fmt: string) => {
        const cell = line.getCell(col(j));
        setFormula(cell, formula);
        cell.numFmt = fmt;
      };
      if (k === 0) line.getCell(1).value = y;
      const dCell = line.getCell(col(K.d));
      setFormula(dCell, `${addr(a.firstRow + y, C.cashFlow)}-${addr(b.firstRow + y, C.cashFlow)}`, A[y] - B[y]);
      dCell.numFmt = FMT.money;
      f(K.dd, `${at(K.d)}*${addr(a.firstRow + y, C.df)}`, FMT.money);
      f(K.sign, `IF(ABS(${at(K.d)})<${EPS},0,SIGN(${at(K.d)}))`, FMT.count);
      if (y === 0) {
        f(K.first, at(K.sign), FMT.count);
        f(K.last, at(K.sign), FMT.count);
        f(K.change, '0', FMT.count);
        f(K.t, `IF(${at(K.first)}=0,-1,0)`, FMT.count);
        f(K.cum, `IF(${at(K.first)}=0,0,${at(K.d)})`, FMT.money);
        f(K.cumD, `IF(${at(K.first)}=0,0,${at(K.dd)})`, FMT.money);
        f(K.pb, '""', FMT.years);
        f(K.dpb, '""', FMT.years);
        continue;
      }
      f(K.first, `IF(${prev(K.first)}<>0,${prev(K.first)},${at(K.sign)})`, FMT.count);
      f(K.last, `IF(${at(K.sign)}=0,${prev(K.last)},${at(K.sign)})`, FMT.count);
      f(K.change, `IF(AND(${at(K.sign)}<>0,${prev(K.last)}<>0,${at(K.sign)}<>${prev(K.last)}),1,0)`, FMT.count);
      f(K.t, `IF(${at(K.first)}=0,-1,${prev(K.t)}+1)`, FMT.count);
      f(K.cum, `IF(${at(K.first)}=0,0,${prev(K.cum)}+${at(K.d)})`, FMT.money);
      f(K.cumD, `IF(${at(K.first)}=0,0,${prev(K.cumD)}+${at(K.dd)})`, FMT.money);
      const above = (j: number) => `${addr(first, col(j), true)}:${prev(j)}`;
      f(K.pb, `IF(AND(${at(K.t)}>=1,${at(K.cum)}>-${EPS},COUNT(${above(K.pb)})=0),${at(K.t)}-1+(-${prev(K.cum)})/${at(K.d)},"")`, FMT.years);
      f(K.dpb, `IF(AND(${at(K.t)}>=1,${at(K.cumD)}>-${EPS},COUNT(${above(K.dpb)})=0),${at(K.t)}-1+(-${prev(K.cumD)})/${at(K.dd)},"")`, FMT.years);
    }
  });

  // results table
  const r0 = last + 2;
  const hr = ws.getRow(r0);
  hr.values = ['Comparison', 'ΔNPV', 'IRR', 'Sign changes of ΔCF', 'IRR roots on the grid', 'MIRR', 'Payback (years)', 'Discounted payback (years)', 'Profitability index', 'IRR roots by pieces (−1: grid scanned)', 'Piece holding the root'];
  styleHeader(hr);
  COMPARISONS.forEach((cmp, k) => {
    const r = r0 + 1 + k;
    const col = (j: number) => 2 + k * WIDTH + j;
    const range = (j: number) => `${addr(first, col(j))}:${addr(last, col(j))}`;
    const d = range(K.d);
    const firstSign = addr(last, col(K.first));
    const cmpResult: Comparison = result[cmp.key];
    const a = blocks[cmp.first];
    const capital = `${addr(a.firstRow, C.capital)}:${addr(a.lastRow, C.capital)}`;
    const dfs = `${addr(a.firstRow, C.df)}:${addr(a.lastRow, C.df)}`;
    const years = grid.years(n);
    const pvAt = (rates: string) => `MMULT((1+${rates})^(-${years}),${d})`;
    const cell = (c: number) => ws.getCell(r, c);
    const B = addr(r, 2);
    ws.getCell(r, 1).value = cmp.label;
    setFormula(cell(2), `SUM(${range(K.dd)})`, cmpResult.deltaNpv);
    // the piece test (sheet-irr-grid.ts): roots inside each of the grid's pieces, bounded by the signs of M·ΔCF
    const v = grid.vincent(n);
    const pc = grid.pieces;
    const perPiece = `MMULT(--(${pc.numbers}=TRANSPOSE(${v.ids})),--(MMULT(${v.top},${d})*MMULT(${v.bottom},${d})<0))`;
    const doubtful = `SUMPRODUCT(--(ABS(MMULT(${v.all},${d}))<=0.000000001*MMULT(${v.all},ABS(${d}))))`;
    const edgeZero = `(${pvAt(pc.edges)}=0)`;
    const second = result.options[cmp.second].cashFlows;
    const test = pieceTest(result.options[cmp.first].cashFlows.map((x, y) => x - second[y]));
    const J = addr(r, 10);
    const Kc = addr(r, 11);
    setFormula(
      cell(10),
      `IF(OR(${doubtful}>0,SUMPRODUCT(--(${perPiece}>1))>0),-1,SUMPRODUCT(${perPiece})+SUMPRODUCT(--${edgeZero}))`,
      test.count,
    );
    setFormula(cell(11), `IF(${J}=1,SUMPRODUCT(${perPiece}*${pc.numbers}),"")`, test.piece);
    // where the test cannot decide: every step of the grid, as MODEL.md writes the rule
    const gridRoots = `SUMPRODUCT(--((${pvAt(grid.lo)}*${pvAt(grid.hi)})<0))+SUMPRODUCT(--(${pvAt(grid.all)}=0))`;
    setFormula(cell(5), `IF(${J}>=0,${J},${gridRoots})`);
    // Newton from inside the grid bracket of the one root lands on that root: the bracket is searched in the
    // root's piece only, or is the edge where ΔCF's present value is exactly 0, or (undecided) on the whole grid
    const bracketGuess = (lo: string, hi: string) =>
      `SUMPRODUCT(((${pvAt(lo)}*${pvAt(hi)})<0)*${lo})+0.0005+SUMPRODUCT((${pvAt(hi)}=0)*${hi})`;
    const inPiece = (ref: string, at: 'first' | 'last') => `INDEX(${ref},INDEX(${pc[at]},${Kc}))`;
    const pieceLo = `${inPiece(grid.lo, 'first')}:${inPiece(grid.lo, 'last')}`;
    const pieceHi = `${inPiece(grid.hi, 'first')}:${inPiece(grid.hi, 'last')}`;
    const gridGuess = `SUMPRODUCT(((${pvAt(grid.lo)}*${pvAt(grid.hi)})<0)*${grid.lo})+0.0005+SUMPRODUCT((${pvAt(grid.all)}=0)*${grid.all})`;
    const guess = `IF(${J}=1,IF(${Kc}=0,SUMPRODUCT(${edgeZero}*${pc.edges}),${bracketGuess(pieceLo, pieceHi)}),${gridGuess})`;
    setFormula(cell(3), `IF(AND(${addr(r, 5)}=1,${firstSign}<0),IFERROR(IRR(${d},${guess}),"n/a"),"n/a")`, na(cmpResult.irr));
    setFormula(cell(4), `SUM(${range(K.change)})`, cmpResult.irrSignChanges);
    setFormula(
      cell(6),
      `IF(OR(SUMPRODUCT(--(${d}>=${EPS}))=0,SUMPRODUCT(--(${d}<=-${EPS}))=0),"n/a",MIRR(${d},DiscountRate,DiscountRate))`,
      na(cmpResult.mirr),
    );
    setFormula(cell(7), `IF(${firstSign}>=0,0,IF(COUNT(${range(K.pb)})=0,"n/a",SUM(${range(K.pb)})))`, na(cmpResult.paybackYears));
    setFormula(cell(8), `IF(${firstSign}>=0,0,IF(COUNT(${range(K.dpb)})=0,"n/a",SUM(${range(K.dpb)})))`, na(cmpResult.discountedPaybackYears));
    setFormula(
      cell(9),
      `IF(ABS(SUMPRODUCT(${capital},${dfs}))<${EPS},"n/a",1+${B}/(-SUMPRODUCT(${capital},${dfs})))`,
      na(cmpResult.profitabilityIndex),
    );
    [FMT.money, FMT.rate, FMT.count, FMT.count, FMT.rate, FMT.years, FMT.years, FMT.qty2, FMT.count, FMT.count].forEach((fmt, i) => {
      cell(2 + i).numFmt = fmt;
      cell(2 + i).alignment = { horizontal: 'right' };
    });
    if (r !== resultRow(startRow, n, k)) throw new Error('comparison layout: results row moved');
  });
  ws.getRow(r0 + COMPARISONS.length).commit();
  return comparisonRefs(startRow, n);
}
