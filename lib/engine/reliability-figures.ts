/**
 * Reading figures of an engine type's Weibull failure law, for the engine
 * library: median and mean life of a new engine, and the chance that a new
 * engine fails in service before its planned life. Pure; the Weibull law is
 * R(x) = exp(−(x/η)^β) for a life that starts at age 0 (MODEL.md section 11).
 */
import { gamma } from 'mathjs';

/**
 * Median life of a new engine, hours: the age x with R(x) = 1/2,
 * η·(ln 2)^(1/β).
 *
 * @example weibullMedianLife(1, 1000) // = 1000·ln 2 ≈ 693.147
 */
export function weibullMedianLife(shape: number, scale: number): number {
  return scale * Math.LN2 ** (1 / shape);
}

/**
 * Mean life of a new engine, hours: E[X] = η·Γ(1 + 1/β).
 *
 * @example weibullMeanLife(2, 1000) // = 1000·Γ(1.5) = 1000·√π/2 ≈ 886.227
 */
export function weibullMeanLife(shape: number, scale: number): number {
  return scale * gamma(1 + 1 / shape);
}

/**
 * Probability that a new engine fails in service before it reaches its
 * planned life ℓ: F(ℓ) = 1 − exp(−(ℓ/η)^β).
 *
 * @example failureBeforeLife(1000, 1, 1000) // = 1 − e^−1 ≈ 0.632121
 */
export function failureBeforeLife(lifeHours: number, shape: number, scale: number): number {
  if (!(lifeHours > 0)) return 0;
  return -Math.expm1(-((lifeHours / scale) ** shape));
}

export interface ReliabilityFigures {
  medianLifeHours: number;
  meanLifeHours: number;
  /** probability a new engine fails before its planned life */
  failureBeforePlanned: number;
  /** the planned life lies above the median life: most engines fail before their overhaul */
  plannedAboveMedian: boolean;
}

/** The engine library's figures for one engine type. */
export function reliabilityFigures(e: { lifeHours: number; weibullShape: number; weibullScaleHours: number }): ReliabilityFigures {
  const medianLifeHours = weibullMedianLife(e.weibullShape, e.weibullScaleHours);
  return {
    medianLifeHours,
    meanLifeHours: weibullMeanLife(e.weibullShape, e.weibullScaleHours),
    failureBeforePlanned: failureBeforeLife(e.lifeHours, e.weibullShape, e.weibullScaleHours),
    plannedAboveMedian: e.lifeHours > medianLifeHours,
  };
}
