/**
 * Helpers for showing and adopting the recommended overhaul life of an engine
 * type (lib/engine/age-replacement.ts). Pure: no Next, React, Knex or I/O.
 */
import { ageReplacementCostRate, type AgeReplacementInput } from '@/lib/engine/age-replacement';
import { LIMITS } from '@/lib/validation/case';

/** A planned life is adopted in whole hundreds of hours (nearest 100 h, halves up), within the engine schema's limits. */
export const ADOPT_ROUNDING_HOURS = 100;

/**
 * The planned life to store when a planner adopts the optimum T* (hours):
 * T* rounded to the nearest 100 h (halves up), clamped to the engine
 * schema's lifeHours range (500–200,000 h). null (optimum at infinity): null,
 * nothing to adopt.
 */
export function roundAdoptedLife(optimumHours: number | null): number | null {
  if (optimumHours === null || !Number.isFinite(optimumHours)) return null;
  const r = Math.floor(optimumHours / ADOPT_ROUNDING_HOURS + 0.5) * ADOPT_ROUNDING_HOURS;
  return Math.min(LIMITS.lifeHours.max, Math.max(LIMITS.lifeHours.min, r));
}

/**
 * The saving per operating hour of planning at `recommendedHours` instead of
 * `currentHours`: C(current) − C(recommended), money per hour (positive: the
 * recommendation is cheaper). null recommended (run to failure): the rate at
 * infinity, Cf / E[X], is passed as `runToFailureCostPerHour`.
 */
export function savingPerHour(
  input: AgeReplacementInput, currentHours: number, recommendedHours: number | null, runToFailureCostPerHour: number,
): number {
  const at = recommendedHours === null ? runToFailureCostPerHour : ageReplacementCostRate(recommendedHours, input);
  return ageReplacementCostRate(currentHours, input) - at;
}
