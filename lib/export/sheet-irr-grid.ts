/**
 * The IRR grid of MODEL.md section 8: rates (k − 990)/1000 for k = 0..10990,
 * and the years 0..N as a row. Each comparison counts the roots of
 * Σ ΔCF_y/(1+i)^y on this grid by formula, so "exactly one rate" — the rule
 * that decides whether an IRR is shown — is live too.
 *
 * Counting on all 10,991 rates costs a spreadsheet about 11,000 × (N+1)
 * powers per comparison, which made recomputing a workbook slow, so the
 * count is first tried on 32 pieces of the grid (steps ka..kb, ka and kb
 * = round(10990·p/32)) without visiting their steps. With x = 1/(1+i) the sum
 * is the polynomial f(x) = Σ ΔCF_y·x^y; for a piece whose rates map to the
 * x-interval (xlo, xhi), Descartes' rule of signs applied to
 *   (1+t)^N · f((xlo + xhi·t)/(1+t)) = Σ_j t^j · Σ_y M[j][y]·ΔCF_y,
 *   M[j][y] = Σ_{a+b=j} C(y,a)·xlo^(y−a)·xhi^a·C(N−y,b)  (all > 0),
 * (Vincent's transformation, as lib/engine/irr.ts uses) bounds the roots of f
 * strictly inside the piece: 0 sign variations of those coefficients → none,
 * 1 → exactly one, and that one simple, so the grid sees it exactly once
 * (one pair of neighbouring steps of opposite sign, or one exact zero).
 * When every piece has at most one variation and no coefficient is too small
 * to trust its sign (|coefficient| ≤ 1e-9 × the same sum over |ΔCF|), the
 * grid's count is the sum over the pieces plus the exact zeros at the 33
 * piece edges. Otherwise (a piece with two or more variations, a doubtful
 * sign, ΔCF all zero) the workbook counts on the whole grid as before. The
 * matrices M are constants of N, written once per horizon on this sheet.
 *
 * Worked example (a test): ΔCF = −123,400, 36,200, 54,800, 48,100 (N = 3)
 * has one root, i ≈ 5.96 %, in piece 4 (steps 1030..1374, rates
 * 4.0 %..38.4 %); every piece shows at most one variation, piece 4 exactly
 * one: count 1, piece 4. ΔCF = −100, 230, −132 has two roots, 10 % and 20 %,
 * both in piece 4: two variations there, so the grid is scanned (count −1).
 */
import type ExcelJS from 'exceljs';
import { colLetter, sheetRef } from './cells';

export const IRR_GRID_SHEET = 'IRR grid';
const STEPS = 10991;
const LAST_K = STEPS - 1;
/** Pieces of the grid the sign test works on. */
export const IRR_PIECES = 32;
/** Relative size below which a transformed coefficient's sign is not trusted. */
const DOUBT = 1e-9;

export interface IrrGridRefs {
  /** rates of steps 0..10989, 1..10990 and 0..10990 */
  lo: string;
  hi: string;
  all: string;
  /** the row 0..n of years */
  years(n: number): string;
  /** the pieces: numbers 1..P, first and last index into `lo`/`hi` of each, and the P+1 edge rates */
  pieces: { numbers: string; first: string; last: string; edges: string };
  /** Vincent matrices of horizon n stacked by piece, the same without their last / first row, and the piece of each pair of neighbouring rows (0 across pieces) */
  vincent(n: number): { all: string; top: string; bottom: string; ids: string };
}

/** The grid step where piece p (0-based) starts; piece p covers steps edgeStep(p)..edgeStep(p+1). */
export function edgeStep(p: number): number {
  return Math.round((LAST_K * p) / IRR_PIECES);
}

const rateOf = (k: number) => (k - 990) / 1000;

function binomial(n: number, k: number): number {
  let r = 1;
  for (let i = 1; i <= k; i++) r = (r * (n - k + i)) / i;
  return r;
}

const matrices = new Map<string, number[][]>();
/** Numbers held in `matrices`, and the most it holds (16 MB of numbers: some 60 horizons of 30 years, 6 of 100). */
let held = 0;
const HOLD = 2_000_000;

/**
 * M[j][y] of piece p for horizon n (see the module comment); computed once
 * per (n, p) while the cache holds it. A workbook asks for each truck's
 * horizon in turn (the truck sheets' cached piece counts), so the cache
 * keeps every horizon of a fleet as long as they fit.
 */
export function vincentMatrix(n: number, p: number): number[][] {
  const key = `${n}:${p}`;
  let m = matrices.get(key);
  if (!m) {
    const size = (n + 1) * (n + 1);
    if (held + size > HOLD) {
      matrices.clear();
      held = 0;
    }
    matrices.set(key, (m = computeMatrix(n, p)));
    held += size;
  }
  return m;
}

function computeMatrix(n: number, p: number): number[][] {
  const xlo = 1 / (1 + rateOf(edgeStep(p + 1)));
  const xhi = 1 / (1 + rateOf(edgeStep(p)));
  const m: number[][] = [];
  for (let j = 0; j <= n; j++) {
    const row: number[] = [];
    for (let y = 0; y <= n; y++) {
      let s = 0;
      for (let a = Math.max(0, j - (n - y)); a <= Math.min(j, y); a++) {
        s += binomial(y, a) * xlo ** (y - a) * xhi ** a * binomial(n - y, j - a);
      }
      row.push(s);
    }
    m.push(row);
  }
  return m;
}

/**
 * The piece test in plain numbers, as the workbook's formulas compute it (the
 * cached values of its cells): the number of grid roots, or −1 where the
 * test cannot decide; and the piece (1..P) holding the root when there is
 * exactly one inside a piece, 0 when the one root is an exact zero at an edge.
 */
export function pieceTest(d: readonly number[]): { count: number; piece: number | '' } {
  const n = d.length - 1;
  let inside = 0;
  let piece = 0;
  for (let p = 0; p < IRR_PIECES; p++) {
    let variations = 0;
    let last = 0;
    const m = vincentMatrix(n, p);
    for (let j = 0; j <= n; j++) {
      const row = m[j];
      let w = 0;
      let mag = 0;
      for (let y = 0; y <= n; y++) {
        w += row[y] * d[y];
        mag += row[y] * Math.abs(d[y]);
      }
      if (!(Math.abs(w) > DOUBT * mag)) return { count: -1, piece: '' };
      const sign = w > 0 ? 1 : -1;
      if (last !== 0 && sign !== last) variations++;
      last = sign;
    }
    if (variations > 1) return { count: -1, piece: '' };
    if (variations === 1) piece = p + 1;
    inside += variations;
  }
  let zeros = 0;
  for (let p = 0; p <= IRR_PIECES; p++) {
    const x = 1 / (1 + rateOf(edgeStep(p)));
    let acc = 0;
    for (let y = n; y >= 0; y--) acc = acc * x + d[y];
    if (acc === 0) zeros++;
  }
  const count = inside + zeros;
  return { count, piece: count === 1 ? (inside === 1 ? piece : 0) : '' };
}

/** Columns of the sheet: A rates, C.. years; then the piece table; then one Vincent block per horizon. */
function layout(maxYears: number, horizons: readonly number[]) {
  const piecesCol = 3 + maxYears + 2;
  const blocks = new Map<number, number>();
  let col = piecesCol + 5;
  for (const n of [...new Set(horizons)].sort((a, b) => a - b)) {
    blocks.set(n, col);
    col += n + 3;
  }
  return { piecesCol, blocks };
}

/**
 * The grid's ranges: fixed by the longest horizon and the set of horizons,
 * so truck sheets can refer to them before the grid sheet is added (it goes last).
 */
export function irrGridRefs(maxYears: number, horizons: readonly number[]): IrrGridRefs {
  const s = sheetRef(IRR_GRID_SHEET);
  const { piecesCol, blocks } = layout(maxYears, horizons);
  const col = (c: number, r1: number, r2: number) => `${s}$${colLetter(c)}$${r1}:$${colLetter(c)}$${r2}`;
  return {
    lo: `${s}$A$2:$A$${STEPS}`,
    hi: `${s}$A$3:$A$${STEPS + 1}`,
    all: `${s}$A$2:$A$${STEPS + 1}`,
    years: (n) => `${s}$C$1:$${colLetter(3 + n)}$1`,
    pieces: {
      numbers: col(piecesCol, 2, IRR_PIECES + 1),
      first: col(piecesCol + 1, 2, IRR_PIECES + 1),
      last: col(piecesCol + 2, 2, IRR_PIECES + 1),
      edges: col(piecesCol + 3, 2, IRR_PIECES + 2),
    },
    vincent: (n) => {
      const c = blocks.get(n);
      if (c === undefined) throw new Error(`no IRR grid block for horizon ${n}`);
      const rows = IRR_PIECES * (n + 1);
      const box = (r1: number, r2: number) => `${s}$${colLetter(c)}$${r1}:$${colLetter(c + n)}$${r2}`;
      return { all: box(2, rows + 1), top: box(2, rows), bottom: box(3, rows + 1), ids: col(c + n + 1, 2, rows) };
    },
  };
}

/**
 * Written row by row (a streamed sheet cannot go back to a committed row):
 * the rates in column A, the notes, the piece table and the Vincent blocks
 * side by side, each row committed once its cells are set.
 */
export function addIrrGridSheet(wb: ExcelJS.Workbook, maxYears: number, horizons: readonly number[]): void {
  const ws = wb.addWorksheet(IRR_GRID_SHEET);
  const { piecesCol, blocks } = layout(maxYears, horizons);
  const notes: Record<number, string> = {
    3: 'IRR roots are counted where Σ ΔCF/(1+i)^y changes sign between neighbouring rates of this grid, or is exactly 0 at one.',
    4:
      'First on 32 pieces of the grid: the signs of Σ M[j][y]·ΔCF_y (the blocks on the right, one per horizon N) bound the roots inside each piece (Descartes, Vincent); ' +
      'where a piece may hold two or more, the whole grid is scanned.',
  };

  const head = ws.getRow(1);
  head.getCell(1).value = 'Rate';
  head.getCell(2).value = 'Years →';
  for (let y = 0; y <= maxYears; y++) head.getCell(3 + y).value = y;
  ['Piece', 'First pair (row of the grid)', 'Last pair', 'Edge rate'].forEach((h, i) => (head.getCell(piecesCol + i).value = h));
  // one matrix per horizon at a time: the piece changes every n + 1 rows
  const vincent = [...blocks].map(([n, c]) => ({ n, c, rows: IRR_PIECES * (n + 1), piece: -1, m: [] as number[][] }));
  for (const b of vincent) {
    head.getCell(b.c).value = `M, N = ${b.n}`;
    head.getCell(b.c + b.n + 1).value = 'Piece of the pair';
  }
  head.commit();

  const lastRow = Math.max(STEPS + 1, ...vincent.map((b) => b.rows + 1));
  for (let r = 2; r <= lastRow; r++) {
    const row = ws.getRow(r);
    const k = r - 2;
    if (k < STEPS) {
      const c = row.getCell(1);
      c.value = rateOf(k);
      c.numFmt = '0.0%';
    }
    if (notes[r]) row.getCell(2).value = notes[r];
    const p = r - 2;
    if (p <= IRR_PIECES) {
      if (p < IRR_PIECES) {
        row.getCell(piecesCol).value = p + 1;
        // pairs (k, k+1) for k = edgeStep(p)..edgeStep(p+1) − 1: positions k+1 in the ranges `lo` and `hi`
        row.getCell(piecesCol + 1).value = edgeStep(p) + 1;
        row.getCell(piecesCol + 2).value = edgeStep(p + 1);
      }
      row.getCell(piecesCol + 3).value = rateOf(edgeStep(p));
    }
    for (const b of vincent) {
      const at = r - 2;
      if (at >= b.rows) continue;
      const { n, c } = b;
      const piece = Math.floor(at / (n + 1));
      const j = at % (n + 1);
      if (piece !== b.piece) {
        b.piece = piece;
        b.m = vincentMatrix(n, piece);
      }
      for (let y = 0; y <= n; y++) row.getCell(c + y).value = b.m[j][y];
      if (piece < IRR_PIECES - 1 || j < n) row.getCell(c + n + 1).value = j < n ? piece + 1 : 0;
    }
    row.commit();
  }
  ws.commit();
}
