/**
 * Schemas of a monthly reading (issue 20), shared by the form, the route
 * handlers and the readings import. Every number has a finite range
 * (`ranged`, listed in docs/methodology.md "Input limits").
 */
import { z } from '@/lib/validation/zod';
import { caseNameSchema } from './business-case';
import { MAX_MONEY, ranged } from './case';
import { plainText } from './fleet';

/** Highest hour-meter reading: the register's largest engine hours. */
export const MAX_HOUR_METER = 1_000_000;
/** Fuel dispensed in a month: 744 h at 1,000 L/h is well inside. */
export const MAX_MONTH_LITRES = 1_000_000;
/** Tonnes hauled in a month: 744 h at 10,000 t/h is well inside. */
export const MAX_MONTH_TONNES = 10_000_000;
/** Longest derivation window, in months. */
export const MAX_WINDOW_MONTHS = 60;

const MONTH = /^(\d{4})-(0[1-9]|1[0-2])$/;
const DAY = /^(\d{4})-(0[1-9]|1[0-2])-(0[1-9]|[12]\d|3[01])$/;

/** "YYYY-MM" of a date, in UTC. */
export const monthOf = (d: Date) => d.toISOString().slice(0, 7);
const dayOf = (d: Date) => d.toISOString().slice(0, 10);

const whole = (min: number, max: number, unit = '') => ranged(min, max, unit).int('must be a whole number');

export const monthText = z
  .string('must be a month as YYYY-MM')
  .trim()
  .regex(MONTH, 'must be a month as YYYY-MM, e.g. 2026-04')
  .refine((m) => Number(m.slice(0, 4)) >= 1950, 'must be 1950 or later');

const dayText = z
  .string('must be a date as YYYY-MM-DD')
  .trim()
  .regex(DAY, 'must be a date as YYYY-MM-DD, e.g. 2026-04-17')
  .refine((d) => !Number.isNaN(Date.parse(`${d}T00:00:00Z`)) && dayOf(new Date(`${d}T00:00:00Z`)) === d, 'is not a calendar date');

/** The fields of one reading, without its truck (the import names it by unit number, the form by id). */
export const readingFieldsSchema = z.object({
  month: monthText,
  hourMeter: ranged(0, MAX_HOUR_METER, 'hours'),
  fuelLitres: ranged(0, MAX_MONTH_LITRES, 'litres'),
  tonnes: ranged(0, MAX_MONTH_TONNES, 'tonnes').nullable().default(null),
  overhauls: whole(0, 5).default(0),
  failures: whole(0, 31).default(0),
  daysDown: ranged(0, 31, 'days').default(0),
  repowerDate: dayText.nullable().default(null),
  repowerCost: ranged(0, MAX_MONEY).nullable().default(null),
  repowerEngineTypeId: z.number().int().positive('must be the id of an engine type of this workspace').nullable().default(null),
  notes: plainText(2000).default(''),
});

/**
 * Checks that need today's date or more than one field: nothing in the
 * future, a repower's date inside its month, a repower cost only with a
 * repower. `today` is passed so tests can fix it.
 */
export function readingProblems(r: z.output<typeof readingFieldsSchema>, today: Date): Array<{ field: string; message: string }> {
  const out: Array<{ field: string; message: string }> = [];
  const thisMonth = monthOf(today);
  if (r.month > thisMonth) out.push({ field: 'month', message: `${r.month} is in the future (this month is ${thisMonth})` });
  if (r.repowerDate !== null) {
    if (r.repowerDate.slice(0, 7) !== r.month) out.push({ field: 'repowerDate', message: `must be inside the month ${r.month}` });
    else if (r.repowerDate > dayOf(today)) out.push({ field: 'repowerDate', message: `${r.repowerDate} is in the future` });
  } else {
    if (r.repowerCost !== null) out.push({ field: 'repowerCost', message: 'needs a repower date (no repower is recorded in this month)' });
    if (r.repowerEngineTypeId !== null) out.push({ field: 'repowerEngineTypeId', message: 'needs a repower date (no repower is recorded in this month)' });
  }
  return out;
}

export const readingInputSchema = readingFieldsSchema.extend({
  truckId: z.number('must be the id of a truck of this workspace').int().positive('must be the id of a truck of this workspace'),
});
export const readingUpdateSchema = readingInputSchema.extend({ version: z.number('must be the version you loaded').int().min(1) });
export type ReadingFields = z.output<typeof readingFieldsSchema>;
export type ReadingInput = z.output<typeof readingInputSchema>;

export const windowMonthsSchema = whole(1, MAX_WINDOW_MONTHS, 'months');

/** "Use these figures": which derived figures to write, with the truck's version as loaded. */
export const acceptSchema = z.object({
  version: z.number('must be the version you loaded').int().min(1),
  windowMonths: windowMonthsSchema,
  fields: z
    .array(z.enum(['engineHours', 'annualHours', 'fuelBurnLitresPerHour', 'engineTypeId']))
    .min(1, 'choose at least one figure')
    .max(4),
});

/** The derivation window when none is asked (the readings page's default too). */
export const DEFAULT_WINDOW_MONTHS = 12;

/** Re-forecast (POST …/cases/[id]/reforecast): the window of the derived figures and, optionally, the new case's name. */
export const reforecastSchema = z.strictObject({
  windowMonths: windowMonthsSchema.default(DEFAULT_WINDOW_MONTHS),
  name: caseNameSchema.optional(),
});
