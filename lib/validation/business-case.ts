/**
 * A business case as stored: a name, an assumption set, a selection of
 * trucks with the repower offer for each (null = the truck's own offer), and
 * the capital-plan settings. One schema per shape, shared by forms and handlers.
 */
import { z } from '@/lib/validation/zod';
import { CASE_LIST_LIMITS, LIMITS, ranged, truckSchema } from './case';
import { plainText } from './fleet';

/** Largest budget for one year of the capital plan. */
export const MAX_BUDGET = 1e12;

/** Longest planned delay the programme considers, months. */
export const MAX_DELAY_MONTHS = 12;
/** Planned delay the programme considers when the plan does not say. */
export const DEFAULT_MAX_DELAY_MONTHS = 6;

const id = z.number({ error: 'must be a number' }).int('must be a whole number').positive('must be a positive id');

/** The register's text rule (no leading =, +, - or @: a spreadsheet would read a formula), as every stored name. */
export const caseNameSchema = plainText(200).pipe(z.string().min(1, 'must not be empty'));

export const selectionSchema = z
  .array(z.strictObject({ truckId: id, repowerOfferId: id.nullable() }))
  .min(1, 'choose at least one truck')
  .refine((s) => new Set(s.map((x) => x.truckId)).size === s.length, 'lists a truck twice');

export const planSettingsSchema = z.strictObject({
  /** budget per year (the period of the spend, "0" = now); absent or null = no limit */
  budgets: z.record(
    z.string().regex(/^\d{1,3}$/, 'year must be a whole number 0–999'),
    // a year's budget for the whole fleet: up to 100 × the largest single amount a case accepts (1e10)
    z.number({ error: 'must be a number' }).min(0, 'must not be negative').max(MAX_BUDGET, 'must be at most 1,000,000,000,000').nullable(),
  ),
  swapsPerMonth: z.number({ error: 'must be a number' }).int('must be a whole number').min(1, 'must be at least 1').max(100, 'must be at most 100'),
  /** the plan's month 0, "YYYY-MM" */
  startMonth: z.string().regex(/^\d{4}-(0[1-9]|1[0-2])$/, 'must be a month as YYYY-MM'),
  /**
   * the shop's swaps in a month other than `swapsPerMonth` (month index from the plan's month 0, "0"–"239");
   * 0 = a shutdown month. Absent = no override.
   */
  capacityByMonth: z
    .record(
      z.string().regex(/^(\d|[1-9]\d|1\d\d|2[0-3]\d)$/, 'month must be a whole number 0–239'),
      z.number({ error: 'must be a number' }).int('must be a whole number').min(0, 'must not be negative').max(100, 'must be at most 100'),
    )
    .optional(),
  /** the most months the programme may plan a swap past its due month (0 = never late) */
  maxDelayMonths: z.number({ error: 'must be a number' }).int('must be a whole number').min(0, 'must not be negative').max(MAX_DELAY_MONTHS, `must be at most ${MAX_DELAY_MONTHS}`).optional(),
});

export const createCaseSchema = z.strictObject({
  name: caseNameSchema,
  assumptionSetId: id,
  selection: selectionSchema,
});

/**
 * The planned overhaul life a case adopts for an engine type in place of the
 * engine library's (issue 15: the recommended overhaul life, or any other):
 * whole hours within the case file's `lifeHours` range (docs/methodology.md,
 * "Input limits"). By engine type row id (as text, the JSON key).
 */
export const engineLifeHoursSchema = ranged(LIMITS.lifeHours.min, LIMITS.lifeHours.max, 'hours').int('must be a whole number of hours');
export const engineLivesSchema = z
  .record(z.string(), engineLifeHoursSchema)
  .superRefine((m, ctx) => {
    const keys = Object.keys(m);
    if (keys.length > CASE_LIST_LIMITS.engines) ctx.addIssue({ code: 'custom', message: `must list at most ${CASE_LIST_LIMITS.engines} engine types` });
    // zod's own message for a bad record key does not name the rule
    for (const k of keys) if (!/^[1-9]\d{0,8}$/.test(k)) ctx.addIssue({ code: 'custom', path: [k], message: 'must be an engine type id' });
  });
export type EngineLives = z.infer<typeof engineLivesSchema>;

/** Stored engineLives JSON (migration 0019), or {} when none or unreadable (the case then reads the library). */
export function readEngineLives(json: string | null | undefined): EngineLives {
  if (!json) return {};
  try {
    const parsed = engineLivesSchema.safeParse(JSON.parse(json));
    return parsed.success ? parsed.data : {};
  } catch {
    return {};
  }
}

export const updateCaseSchema = z.strictObject({
  version: z.number().int().positive('must be the version you loaded'),
  name: caseNameSchema.optional(),
  assumptionSetId: id.optional(),
  selection: selectionSchema.optional(),
  plan: planSettingsSchema.optional(),
  /** the whole map of the case's engine-life overrides (replaces the stored one; {} removes all) */
  engineLives: engineLivesSchema.optional(),
});

export const copyCaseSchema = z.strictObject({ name: caseNameSchema.optional() });

/**
 * A case's own figures for a truck in place of the register's (a re-forecast
 * case holds those derived from the truck's readings; migration 0018). Each
 * figure has the case file's own range.
 */
export const caseTruckFiguresSchema = z.strictObject({
  engineHours: truckSchema.shape.engineHours.optional(),
  annualHours: truckSchema.shape.annualHours.optional(),
  fuelBurnLitresPerHour: ranged(0, 10_000, 'litres per hour', true).optional(),
  engineTypeId: id.optional(),
});
/** By truck row id (as text, the JSON key). */
export const truckFiguresSchema = z.record(z.string().regex(/^\d{1,9}$/, 'must be a truck id'), caseTruckFiguresSchema);
export type CaseTruckFigures = z.infer<typeof caseTruckFiguresSchema>;
export type TruckFigures = Record<string, CaseTruckFigures>;

/** Stored truckFigures JSON, or {} when none (or unreadable: the case then reads the register). */
export function readTruckFigures(json: string | null | undefined): TruckFigures {
  if (!json) return {};
  try {
    const parsed = truckFiguresSchema.safeParse(JSON.parse(json));
    return parsed.success ? parsed.data : {};
  } catch {
    return {};
  }
}

export type Selection = z.infer<typeof selectionSchema>;
export type PlanSettings = z.infer<typeof planSettingsSchema>;
export type CreateCaseInput = z.infer<typeof createCaseSchema>;
export type UpdateCaseInput = z.infer<typeof updateCaseSchema>;

export const DEFAULT_SWAPS_PER_MONTH = 2;

/** Stored plan JSON with defaults filled in; the start month defaults to the month the case was made. */
export function readPlanSettings(json: string | null | undefined, createdAt: string): PlanSettings {
  let raw: Partial<PlanSettings> = {};
  try {
    raw = json ? JSON.parse(json) : {};
  } catch {
    raw = {};
  }
  return {
    budgets: raw.budgets ?? {},
    swapsPerMonth: raw.swapsPerMonth ?? DEFAULT_SWAPS_PER_MONTH,
    startMonth: raw.startMonth ?? createdAt.slice(0, 7),
    capacityByMonth: raw.capacityByMonth ?? {},
    maxDelayMonths: raw.maxDelayMonths ?? DEFAULT_MAX_DELAY_MONTHS,
  };
}
