/**
 * Input distributions for Monte Carlo, each sampled by inverse transform from
 * one uniform u in (0, 1), so a seeded stream of uniforms fixes every draw.
 */

export type Distribution =
  /** the driver keeps its value in the case */
  | { kind: 'fixed' }
  | { kind: 'uniform'; min: number; max: number }
  | { kind: 'triangular'; min: number; mode: number; max: number }
  /** normal(mean, sd) truncated to [min, max] */
  | { kind: 'normal'; mean: number; sd: number; min: number; max: number };

/**
 * Complementary error function, Chebyshev fit with relative error below
 * 1.2e-7 everywhere (Press et al., Numerical Recipes, 2nd ed., §6.2, erfcc).
 *
 * @example erfc(0) // = 1
 */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z - 1.26551223 +
        t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

/** Standard normal CDF Φ(z) = erfc(−z/√2)/2. @example normalCdf(0) // = 0.5 */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / Math.SQRT2);
}

/**
 * Standard normal quantile Φ⁻¹(p), P. J. Acklam's rational approximation
 * (relative error below 1.15e-9), p in (0, 1).
 *
 * @example normalQuantile(0.975) // ≈ 1.959964
 */
export function normalQuantile(p: number): number {
  const a = [-3.969683028665376e1, 2.209460984245205e2, -2.759285104469687e2, 1.38357751867269e2, -3.066479806614716e1, 2.506628277459239];
  const b = [-5.447609879822406e1, 1.615858368580409e2, -1.556989798598866e2, 6.680131188771972e1, -1.328068155288572e1];
  const c = [-7.784894002430293e-3, -3.223964580411365e-1, -2.400758277161838, -2.549732539343734, 4.374664141464968, 2.938163982698783];
  const d = [7.784695709041462e-3, 3.224671290700398e-1, 2.445134137142996, 3.754408661907416];
  const lowP = 0.02425;
  if (p < lowP) {
    const q = Math.sqrt(-2 * Math.log(p));
    return (((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  if (p > 1 - lowP) {
    const q = Math.sqrt(-2 * Math.log(1 - p));
    return -(((((c[0] * q + c[1]) * q + c[2]) * q + c[3]) * q + c[4]) * q + c[5]) / ((((d[0] * q + d[1]) * q + d[2]) * q + d[3]) * q + 1);
  }
  const q = p - 0.5;
  const r = q * q;
  return ((((((a[0] * r + a[1]) * r + a[2]) * r + a[3]) * r + a[4]) * r + a[5]) * q) / (((((b[0] * r + b[1]) * r + b[2]) * r + b[3]) * r + b[4]) * r + 1);
}

/**
 * The value of a distribution at quantile u (inverse CDF). `base` is the
 * driver's value in the case, returned by `fixed`.
 *
 * - uniform: min + u·(max − min)
 * - triangular: min + √(u·(max−min)(mode−min)) below F(mode) = (mode−min)/(max−min), else max − √((1−u)(max−min)(max−mode))
 * - truncated normal: mean + sd·Φ⁻¹(Φ(α) + u·(Φ(β) − Φ(α))), α, β the bounds in sd units, clamped into [min, max]
 *
 * @example sampleDistribution({ kind: 'triangular', min: 0, mode: 1, max: 2 }, 0.5, 0) // = 1
 */
export function sampleDistribution(dist: Distribution, u: number, base: number): number {
  switch (dist.kind) {
    case 'fixed':
      return base;
    case 'uniform':
      return dist.min + u * (dist.max - dist.min);
    case 'triangular': {
      const { min, mode, max } = dist;
      const span = max - min;
      if (span <= 0) return min;
      const f = (mode - min) / span;
      return u < f ? min + Math.sqrt(u * span * (mode - min)) : max - Math.sqrt((1 - u) * span * (max - mode));
    }
    case 'normal': {
      const { mean, sd, min, max } = dist;
      if (sd <= 0) return Math.min(max, Math.max(min, mean));
      const pa = normalCdf((min - mean) / sd);
      const pb = normalCdf((max - mean) / sd);
      const p = Math.min(1 - 1e-15, Math.max(1e-15, pa + u * (pb - pa)));
      return Math.min(max, Math.max(min, mean + sd * normalQuantile(p)));
    }
  }
}

/** Problems with a distribution's parameters (empty when it is usable). */
export function distributionProblems(dist: Distribution): string[] {
  const finite = (v: number) => Number.isFinite(v);
  switch (dist.kind) {
    case 'fixed':
      return [];
    case 'uniform':
      if (!finite(dist.min) || !finite(dist.max)) return ['min and max must be numbers'];
      return dist.min <= dist.max ? [] : ['min must not exceed max'];
    case 'triangular':
      if (![dist.min, dist.mode, dist.max].every(finite)) return ['min, mode and max must be numbers'];
      return dist.min <= dist.mode && dist.mode <= dist.max ? [] : ['must have min ≤ mode ≤ max'];
    case 'normal': {
      if (![dist.mean, dist.sd, dist.min, dist.max].every(finite)) return ['mean, sd, min and max must be numbers'];
      const out: string[] = [];
      if (!(dist.sd >= 0)) out.push('sd must not be negative');
      if (!(dist.min <= dist.max)) out.push('min must not exceed max');
      return out;
    }
  }
}
