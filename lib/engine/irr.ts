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

/** Refine a bracketed root by bisection until the bracket is at most 1e-9 wide. */
export function refineRoot(values: readonly number[], root: IrrRoot): number {
  if (root.exact) return root.lo;
  let lo = root.lo;
  let hi = root.hi;
  let flo = presentValueAt(values, lo);
  while (hi - lo > 1e-9) {
    const mid = (lo + hi) / 2;
    const fm = presentValueAt(values, mid);
    if (fm === 0) return mid;
    if (fm > 0 === flo > 0) {
      lo = mid;
      flo = fm;
    } else hi = mid;
  }
  return (lo + hi) / 2;
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

/**
 * The same roots as `scanIrrRoots`, found without visiting every step.
 *
 * With x = 1/(1+i) > 0 the sum is P(x) − Q(x), P gathering the positive flows
 * and Q the negative ones, both increasing in x. Over a run of steps with x in
 * [xLo, xHi] the sum lies in [P(xLo) − Q(xHi), P(xHi) − Q(xLo)]; when that
 * interval excludes 0 (with a margin for rounding) every step of the run has
 * the same strict sign, so the run holds no root and is skipped. Other runs
 * are halved down to single pairs of steps, which are judged exactly as the
 * scan judges them. Stops once `limit` roots are found.
 */
export function findIrrRoots(values: readonly number[], limit = Infinity): IrrRoot[] {
  const n = values.length;
  const positive = new Float64Array(n);
  const negative = new Float64Array(n);
  for (let y = 0; y < n; y++) {
    if (values[y] > 0) positive[y] = values[y];
    else negative[y] = -values[y];
  }
  const poly = (coef: Float64Array, x: number): number => {
    let acc = 0;
    for (let y = n - 1; y >= 0; y--) acc = acc * x + coef[y];
    return acc;
  };
  const roots: IrrRoot[] = [];
  const at = (k: number) => presentValueAt(values, irrGridRate(k));

  // counts the pairs (k, k+1) for ka ≤ k < kb and exact zeros strictly inside (ka, kb)
  const visit = (ka: number, kb: number, fa: number, fb: number): void => {
    if (roots.length >= limit) return;
    if (kb === ka + 1) {
      if ((fa < 0 && fb > 0) || (fa > 0 && fb < 0)) roots.push({ lo: irrGridRate(ka), hi: irrGridRate(kb), exact: false });
      return;
    }
    const xHi = 1 / (1 + irrGridRate(ka)); // x falls as k rises
    const xLo = 1 / (1 + irrGridRate(kb));
    const pHi = poly(positive, xHi);
    const qHi = poly(negative, xHi);
    const margin = 1e-12 * (pHi + qHi);
    if (poly(positive, xLo) - qHi > margin || pHi - poly(negative, xLo) < -margin) return;
    const km = (ka + kb) >> 1;
    const fm = at(km);
    visit(ka, km, fa, fm);
    if (fm === 0 && roots.length < limit) roots.push({ lo: irrGridRate(km), hi: irrGridRate(km), exact: true });
    visit(km, kb, fm, fb);
  };

  const f0 = at(IRR_GRID_FIRST_K);
  const fLast = at(IRR_GRID_LAST_K);
  if (f0 === 0) roots.push({ lo: irrGridRate(IRR_GRID_FIRST_K), hi: irrGridRate(IRR_GRID_FIRST_K), exact: true });
  visit(IRR_GRID_FIRST_K, IRR_GRID_LAST_K, f0, fLast);
  if (fLast === 0 && roots.length < limit) {
    roots.push({ lo: irrGridRate(IRR_GRID_LAST_K), hi: irrGridRate(IRR_GRID_LAST_K), exact: true });
  }
  return roots;
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
