/**
 * A bracketing root finder: the Illinois variant of regula falsi (Dowell &
 * Jarratt, 1971). It keeps a sign-changing bracket like bisection, so it never
 * leaves [a, b], and converges superlinearly on smooth functions (exactly in
 * one step on a straight line, which most cost drivers are).
 */

export interface RootResult {
  x: number;
  fx: number;
  iterations: number;
}

/**
 * Root of f in [a, b] where f(a) and f(b) have opposite signs (or one is 0).
 * Stops when |f| ≤ fTol or the bracket is narrower than xTol·max(1, |x|);
 * returns the end with the smaller |f|. On a step (a jump across zero) it
 * returns the step's position with the |f| found there: the caller checks.
 *
 * @example findRoot((x) => x * x - 2, 0, 2).x // ≈ 1.41421356
 */
export function findRoot(f: (x: number) => number, a: number, b: number, fa = f(a), fb = f(b), fTol = 1e-9, xTol = 1e-14, maxIter = 200): RootResult {
  if (fa === 0) return { x: a, fx: 0, iterations: 0 };
  if (fb === 0) return { x: b, fx: 0, iterations: 0 };
  if (Math.sign(fa) === Math.sign(fb)) throw new RangeError('findRoot: f(a) and f(b) must have opposite signs');
  let side = 0;
  let i = 0;
  for (; i < maxIter; i++) {
    let x = (a * fb - b * fa) / (fb - fa);
    // fall back to bisection when the secant lands on an end (round-off) or outside
    if (!(x > Math.min(a, b) && x < Math.max(a, b))) x = (a + b) / 2;
    const fx = f(x);
    if (Math.abs(fx) <= fTol) return { x, fx, iterations: i + 1 };
    if (Math.sign(fx) === Math.sign(fb)) {
      b = x;
      fb = fx;
      if (side === -1) fa /= 2;
      side = -1;
    } else {
      a = x;
      fa = fx;
      if (side === 1) fb /= 2;
      side = 1;
    }
    if (Math.abs(b - a) <= xTol * Math.max(1, Math.abs(a))) break;
  }
  // halving above skews the stored f values; report the true ones
  const ta = f(a);
  const tb = f(b);
  return Math.abs(ta) <= Math.abs(tb) ? { x: a, fx: ta, iterations: i } : { x: b, fx: tb, iterations: i };
}
