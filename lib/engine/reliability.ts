/**
 * Weibull reliability (MODEL.md section 3; MIL-HDBK-338B; Nelson, Applied
 * Life Data Analysis, 1982). Ages and scales are engine operating hours;
 * shape β and scale η must be positive.
 */

/**
 * Reliability (survival probability) to age t: R(t) = exp(−(t/η)^β).
 * R(0) = 1.
 *
 * @example weibullReliability(24000, 3.2, 24000) // = exp(−1) ≈ 0.367879
 */
export function weibullReliability(t: number, shape: number, scale: number): number {
  return Math.exp(-Math.pow(t / scale, shape));
}

/**
 * Cumulative probability of failure by age t: F(t) = 1 − exp(−(t/η)^β),
 * as the spreadsheet WEIBULL.DIST(t, β, η, TRUE).
 *
 * @example weibullCdf(105, 20, 100) // ≈ 0.929581
 */
export function weibullCdf(t: number, shape: number, scale: number): number {
  return -Math.expm1(-Math.pow(t / scale, shape));
}

/**
 * Probability of surviving a further t hours given survival to age T:
 * R(T + t) / R(T) = exp((T/η)^β − ((T+t)/η)^β).
 *
 * @example conditionalReliability(0, 5000, 3, 20000) // = 1
 */
export function conditionalReliability(t: number, age: number, shape: number, scale: number): number {
  return Math.exp(Math.pow(age / scale, shape) - Math.pow((age + t) / scale, shape));
}

/**
 * Median failure age of an engine of age a that has survived so far: the age
 * t with R(t)/R(a) = 1/2, t = η·((a/η)^β + ln 2)^(1/β). For a = 0 this is the
 * median life η·(ln 2)^(1/β). Always greater than a.
 *
 * @example medianFailureAge(0, 1, 1000) // = 1000·ln 2 ≈ 693.147
 */
export function medianFailureAge(age: number, shape: number, scale: number): number {
  return scale * power(ageTerm(age, shape, scale) + Math.LN2, 1 / shape);
}

/**
 * x^e for x > 0 as exp(e·ln x): within a few units in the last place of
 * Math.pow (the error is about |e·ln x|·2^−53, relative) and a third faster in
 * V8, which counts when Monte Carlo draws millions of failure ages. Used by
 * the median and sampled failure ages alike, so the median path is the u = ½
 * draw exactly.
 */
function power(x: number, e: number): number {
  return Math.exp(Math.log(x) * e);
}

/**
 * (a/η)^β; for a new engine (a = 0) that is exactly +0 for every β > 0, so the
 * power is skipped (most lives start new, and the powers are the costly part
 * of a Monte Carlo iteration).
 */
function ageTerm(age: number, shape: number, scale: number): number {
  return age === 0 ? 0 : power(age / scale, shape);
}

/**
 * Conditional median residual life: medianFailureAge(a) − a, hours.
 *
 * @example medianResidualLife(500, 1, 1000) // = 1000·ln 2 (no memory when β = 1)
 */
export function medianResidualLife(age: number, shape: number, scale: number): number {
  return medianFailureAge(age, shape, scale) - age;
}

/**
 * Failure age drawn by inverse transform from the Weibull law conditional on
 * survival to `currentAge`: t = η·((a/η)^β − ln(1 − u))^(1/β), so that
 * P(failure by t | survived to a) = u. u comes from the caller's (seeded)
 * uniform generator; it is clamped to [2^−52, 1 − 2^−52] so that the age is
 * finite and greater than a. u = 0.5 gives the median (`medianFailureAge`).
 *
 * @example sampleWeibullAge(0.5, 3.2, 24000, 16500) === medianFailureAge(16500, 3.2, 24000)
 */
export function sampleWeibullAge(u: number, shape: number, scale: number, currentAge = 0): number {
  const p = Math.min(Math.max(u, Number.EPSILON), 1 - Number.EPSILON);
  const age = scale * power(ageTerm(currentAge, shape, scale) - Math.log1p(-p), 1 / shape);
  return age > currentAge ? age : currentAge + Number.EPSILON * Math.max(1, currentAge);
}
