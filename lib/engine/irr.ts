/**
 * Internal rate of return exactly as MODEL.md section 8 defines it: the rate
 * i in (−0.99, 10) at which Σ values[y] / (1+i)^y = 0, when exactly one such
 * rate exists and the first flow that is not zero is negative; null otherwise.
 *
 * Roots are located by the grid of rates i_k = (k − 990)/1000, k = 0..10990:
 * each pair of neighbouring steps whose sums have strictly opposite signs holds
 * one root (refined by bisection to 1e-9), and a step whose sum is exactly 0 is
 * a root. `scanIrrRoots` walks the whole grid as written; `findIrrRoots` gets
 * the same answer faster by skipping runs of the grid where the sum provably
 * keeps one sign (see below), and is what `irr` uses.
 */
import { firstNonZero } from './time-value';

export const IRR_GRID_FIRST_K = 0;
export const IRR_GRID_LAST_K = 10990;

/** The grid rate of step k: (k − 990) / 1000. */
export function irrGridRate(k: number): number {
  return (k - 990) / 1000;
}

/** Σ values[y] / (1+i)^y by Horner's rule in x = 1/(1+i). */
export function presentValueAt(values: readonly number[], rate: number): number {
  const x = 1 / (1 + rate);
  let acc = 0;
  for (let y = values.length - 1; y >= 0; y--) acc = acc * x + values[y];
  return acc;
}

/** A root found on the grid: an exact zero at a step, or a bracket [lo, hi] of neighbouring steps. */
export interface IrrRoot {
  lo: number;
  hi: number;
  exact: boolean;
}

/**
 * Refine a bracketed root by bisection: MODEL.md asks for 1e-9; we go on to
 * the last bit (adjacent doubles, at most ~60 halvings), which is within 1e-9
 * and makes npv(irr) vanish to rounding.
 */
export function refineRoot(values: readonly number[], root: IrrRoot): number {
  if (root.exact) return root.lo;
  let lo = root.lo;
  let hi = root.hi;
  let flo = presentValueAt(values, lo);
  for (let iter = 0; iter < 200; iter++) {
    const mid = (lo + hi) / 2;
    if (mid <= lo || mid >= hi) break;
    const fm = presentValueAt(values, mid);
    if (fm === 0) return mid;
    if (fm > 0 === flo > 0) {
      lo = mid;
      flo = fm;
    } else hi = mid;
  }
  return Math.abs(presentValueAt(values, hi)) < Math.abs(flo) ? hi : lo;
}

/** Every root on the grid, visiting all 10,991 steps (the reference procedure). */
export function scanIrrRoots(values: readonly number[]): IrrRoot[] {
  const roots: IrrRoot[] = [];
  let prev = presentValueAt(values, irrGridRate(IRR_GRID_FIRST_K));
  if (prev === 0) roots.push({ lo: irrGridRate(0), hi: irrGridRate(0), exact: true });
  for (let k = IRR_GRID_FIRST_K + 1; k <= IRR_GRID_LAST_K; k++) {
    const f = presentValueAt(values, irrGridRate(k));
    if (f === 0) roots.push({ lo: irrGridRate(k), hi: irrGridRate(k), exact: true });
    else if ((prev < 0 && f > 0) || (prev > 0 && f < 0)) {
      roots.push({ lo: irrGridRate(k - 1), hi: irrGridRate(k), exact: false });
    }
    prev = f;
  }
  return roots;
}

/** Working state of `findIrrRoots` (plain functions over it, no closures, for speed). */
interface RootSearch {
  values: readonly number[];
  /** the flows as coefficients of x^y, their magnitudes, and two work buffers */
  coef: Float64Array;
  mag: Float64Array;
  work: Float64Array;
  workMag: Float64Array;
  roots: IrrRoot[];
  limit: number;
}

function gridValue(s: RootSearch, k: number): number {
  return presentValueAt(s.values, irrGridRate(k));
}

function opposite(a: number, b: number): boolean {
  return (a < 0 && b > 0) || (a > 0 && b < 0);
}

function pushCell(s: RootSearch, ka: number, kb: number, fa: number, fb: number): void {
  if (opposite(fa, fb)) s.roots.push({ lo: irrGridRate(ka), hi: irrGridRate(kb), exact: false });
}

/** a(x) → a(x + c), in place (Horner's scheme, O(degree²)). */
function taylorShift(a: Float64Array, c: number): void {
  const d = a.length - 1;
  for (let i = 0; i < d; i++) for (let j = d - 1; j >= i; j--) a[j] += c * a[j + 1];
}

/**
 * Descartes' bound on the roots of f in the open x-interval of the run
 * (ka, kb): the sign variations of (1+t)^N · f((xa + xb·t)/(1+t)). Returns
 * 0, 1 (exactly one root, a simple one) or 2 (two or more, or unsure:
 * a coefficient too small to trust its sign, or an overflow).
 */
function descartesBound(s: RootSearch, ka: number, kb: number): number {
  const xa = 1 / (1 + irrGridRate(kb));
  const h = 1 / (1 + irrGridRate(ka)) - xa;
  const w = s.work;
  const m = s.workMag;
  const d = w.length - 1;
  w.set(s.coef);
  m.set(s.mag);
  taylorShift(w, xa); // f(xa + u)
  taylorShift(m, xa);
  let scale = 1; // f(xa + h·u), coefficients reversed: u^N f(xa + h/u)
  for (let j = 0; j <= d; j++) {
    w[j] *= scale;
    m[j] *= scale;
    scale *= h;
  }
  w.reverse();
  m.reverse();
  taylorShift(w, 1);
  taylorShift(m, 1);
  let variations = 0;
  let last = 0;
  for (let j = 0; j <= d; j++) {
    const v = w[j];
    if (!Number.isFinite(v) || !Number.isFinite(m[j])) return 2;
    if (m[j] === 0) continue; // exactly zero: every term was zero
    if (Math.abs(v) <= 1e-9 * m[j]) return 2; // sign not to be trusted
    const sign = v > 0 ? 1 : -1;
    if (last !== 0 && sign !== last) variations++;
    last = sign;
    if (variations >= 2) return 2;
  }
  return variations;
}

/** A run with one crossing and opposite signs at its ends: the crossing found by halving the run. */
function locateCrossing(s: RootSearch, ka: number, kb: number, fa: number, fb: number): void {
  while (kb > ka + 1) {
    const km = (ka + kb) >> 1;
    const fm = gridValue(s, km);
    if (fm === 0) {
      s.roots.push({ lo: irrGridRate(km), hi: irrGridRate(km), exact: true });
      return;
    }
    if (fm > 0 === fa > 0) {
      ka = km;
      fa = fm;
    } else {
      kb = km;
      fb = fm;
    }
  }
  pushCell(s, ka, kb, fa, fb);
}

/** Step by step through a run, as the reference scan does (used only where rounding leaves doubt). */
function scanRun(s: RootSearch, ka: number, kb: number, fa: number): void {
  let prev = fa;
  for (let k = ka + 1; k <= kb && s.roots.length < s.limit; k++) {
    const f = gridValue(s, k);
    if (k < kb && f === 0) s.roots.push({ lo: irrGridRate(k), hi: irrGridRate(k), exact: true });
    else pushCell(s, k - 1, k, prev, f);
    prev = f;
  }
}

/** Roots in the pairs (k, k+1), ka ≤ k < kb, and exact zeros at steps strictly inside (ka, kb). */
function visit(s: RootSearch, ka: number, kb: number, fa: number, fb: number): void {
  if (s.roots.length >= s.limit) return;
  if (kb === ka + 1) {
    pushCell(s, ka, kb, fa, fb);
    return;
  }
  const bound = descartesBound(s, ka, kb);
  if (bound === 0) {
    // no root inside; ends of opposite sign mean a root at an end that rounding moved inside
    if (opposite(fa, fb)) locateCrossing(s, ka, kb, fa, fb);
    return;
  }
  if (bound === 1) {
    if (opposite(fa, fb)) locateCrossing(s, ka, kb, fa, fb);
    else scanRun(s, ka, kb, fa);
    return;
  }
  const km = (ka + kb) >> 1;
  const fm = gridValue(s, km);
  visit(s, ka, km, fa, fm);
  if (fm === 0 && s.roots.length < s.limit) s.roots.push({ lo: irrGridRate(km), hi: irrGridRate(km), exact: true });
  visit(s, km, kb, fm, fb);
}

/** Sign changes along `values`, zero entries skipped (Descartes' bound on the roots x > 0 of Σ values[y]·x^y). */
export function signVariations(values: readonly number[]): number {
  let last = 0;
  let n = 0;
  for (const v of values) {
    if (v === 0) continue;
    const sign = v > 0 ? 1 : -1;
    if (last !== 0 && sign !== last) n++;
    last = sign;
  }
  return n;
}

/**
 * Flows whose own signs change once (an investment, then returns only, the
 * usual case): by Descartes' rule f(x) = Σ values[y]·x^y has exactly one
 * root x > 0, a simple one, so over the grid the sum keeps one sign below
 * the root and the other above it. The grid then holds one root when the
 * sums at its two ends differ in sign (found by halving the steps between,
 * about 14 sums) or one of them is exactly 0, and none otherwise.
 */
function oneSignChange(values: readonly number[], limit: number): IrrRoot[] {
  const s: RootSearch = { values, coef: new Float64Array(0), mag: new Float64Array(0), work: new Float64Array(0), workMag: new Float64Array(0), roots: [], limit };
  const f0 = gridValue(s, IRR_GRID_FIRST_K);
  const fLast = gridValue(s, IRR_GRID_LAST_K);
  if (f0 === 0) s.roots.push({ lo: irrGridRate(IRR_GRID_FIRST_K), hi: irrGridRate(IRR_GRID_FIRST_K), exact: true });
  else if (fLast === 0) s.roots.push({ lo: irrGridRate(IRR_GRID_LAST_K), hi: irrGridRate(IRR_GRID_LAST_K), exact: true });
  else if (opposite(f0, fLast) && limit > 0) locateCrossing(s, IRR_GRID_FIRST_K, IRR_GRID_LAST_K, f0, fLast);
  return s.roots.slice(0, limit);
}

/**
 * The same roots as `scanIrrRoots`, found without visiting every step.
 *
 * With x = 1/(1+i) the sum is a polynomial f(x) = Σ values[y]·x^y. For a run
 * of steps, Descartes' rule of signs applied to f mapped onto the run's
 * x-interval (Vincent's transformation) bounds the roots inside: none → the
 * run is skipped; exactly one → it is found by halving the run; otherwise
 * the run is halved and each half examined again, down to single pairs of
 * steps, judged exactly as the scan judges them. Where rounding makes a
 * coefficient's sign doubtful the run is halved too, and a run whose ends
 * disagree with the bound is scanned step by step, so the answer is the
 * scan's. Flows whose own signs change once skip all that (`oneSignChange`).
 * Stops once `limit` roots are found.
 */
export function findIrrRoots(values: readonly number[], limit = Infinity): IrrRoot[] {
  // the zero polynomial is zero at every step: nothing to isolate
  let allZero = true;
  for (const v of values) if (v !== 0) allZero = false;
  if (allZero) return scanIrrRoots(values).slice(0, limit);
  if (signVariations(values) === 1) return oneSignChange(values, limit);
  // f(x) = x^lo · g(x) with g of degree hi − lo: same roots for x > 0, so the bounds work on g (cheaper)
  let lo = 0;
  while (values[lo] === 0) lo++;
  let hi = values.length - 1;
  while (values[hi] === 0) hi--;
  const d = hi - lo + 1;
  const coef = new Float64Array(d);
  const mag = new Float64Array(d);
  for (let j = 0; j < d; j++) {
    coef[j] = values[lo + j];
    mag[j] = Math.abs(values[lo + j]);
  }
  const s: RootSearch = {
    values,
    coef,
    mag,
    work: new Float64Array(d),
    workMag: new Float64Array(d),
    roots: [],
    limit,
  };
  const f0 = gridValue(s, IRR_GRID_FIRST_K);
  const fLast = gridValue(s, IRR_GRID_LAST_K);
  if (f0 === 0) s.roots.push({ lo: irrGridRate(IRR_GRID_FIRST_K), hi: irrGridRate(IRR_GRID_FIRST_K), exact: true });
  if (d > 1) visit(s, IRR_GRID_FIRST_K, IRR_GRID_LAST_K, f0, fLast);
  if (fLast === 0 && s.roots.length < limit) {
    s.roots.push({ lo: irrGridRate(IRR_GRID_LAST_K), hi: irrGridRate(IRR_GRID_LAST_K), exact: true });
  }
  return s.roots;
}

/**
 * IRR per MODEL.md: the unique rate in (−0.99, 10) where the present value of
 * `values` (values[0] at t = 0, end-of-year powers) is zero, provided the first
 * flow of magnitude ≥ 1e-6 is negative (an investment first). Returns null when
 * there is no investment, no rate, or several rates (read MIRR then).
 * Rate 0 is an ordinary grid step: flows summing to exactly 0 give irr = 0.
 *
 * @example irr([-100, 39, 59, 55, 20]) // ≈ 0.28095
 */
export function irr(values: readonly number[]): number | null {
  const s = firstNonZero(values);
  if (s < 0 || values[s] > 0) return null;
  const roots = findIrrRoots(values, 2);
  if (roots.length !== 1) return null;
  return refineRoot(values, roots[0]);
}
