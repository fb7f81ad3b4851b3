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
  return scale * power(cumulativeHazard(age, shape, scale) + Math.LN2, 1 / shape);
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
 * Cumulative hazard H(a) = (a/η)^β, so that R(a) = exp(−H(a)). For a new
 * engine (a = 0) it is exactly +0 for every β > 0, and the power is skipped
 * (most lives start new, and the powers are the costly part of a Monte Carlo
 * iteration).
 *
 * @example cumulativeHazard(24000, 3.2, 24000) // = 1
 */
export function cumulativeHazard(age: number, shape: number, scale: number): number {
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
 * The same number as `weibullAgeFromExponential(unitExponential(u), …)`.
 *
 * @example sampleWeibullAge(0.5, 3.2, 24000, 16500) === medianFailureAge(16500, 3.2, 24000)
 */
export function sampleWeibullAge(u: number, shape: number, scale: number, currentAge = 0): number {
  return weibullAgeFromExponential(unitExponential(u), shape, scale, currentAge);
}

/**
 * −ln(1 − u), a unit exponential variate from a uniform u (clamped to
 * [2^−52, 1 − 2^−52]): the part of a Weibull draw that does not depend on the
 * law, so one engine life's draw can serve two engines' laws.
 *
 * @example unitExponential(0.5) // = ln 2
 */
export function unitExponential(u: number): number {
  const p = Math.min(Math.max(u, Number.EPSILON), 1 - Number.EPSILON);
  return -Math.log1p(-p);
}

/**
 * Failure age from a unit exponential e, given survival to `currentAge`:
 * t = η·(H(a) + e)^(1/β), H the cumulative hazard; `hazardAtAge` may pass
 * H(a) when the caller already has it. Always above a: should rounding
 * leave t at a, the next representable age above it is returned.
 *
 * @example weibullAgeFromExponential(1, 1, 1000) // = 1000
 */
export function weibullAgeFromExponential(
  e: number,
  shape: number,
  scale: number,
  currentAge = 0,
  hazardAtAge = cumulativeHazard(currentAge, shape, scale),
): number {
  const age = scale * power(hazardAtAge + e, 1 / shape);
  return age > currentAge ? age : currentAge + Number.EPSILON * Math.max(1, currentAge);
}
