/**
 * Schemas of the register's entities (trucks, engine types, repower offers,
 * assumption sets), shared by the forms, the route handlers and the import.
 * Numeric constraints come from the case/1 schema (MODEL.md section 9) so a
 * record the register accepts is one the engine accepts.
 */
import { NUMBER_FORMATS } from '@/lib/number-input';
import { z } from '@/lib/validation/zod';
import { assumptionsSchema, engineSchema, ranged, repowerOfferSchema, truckSchema } from './case';
import { stripControlKeepingLines } from './control-characters';

/**
 * A text cell that starts with one of these is read as a formula by
 * spreadsheet programs (CSV injection), so such text is refused everywhere.
 */
export const FORMULA_START = /^[=+\-@\t\r]/;
const FORMULA_MESSAGE = 'must not start with =, +, - or @ (a spreadsheet would read it as a formula)';

export const plainText = (max: number) =>
  z
    .string('must be text')
    .overwrite(stripControlKeepingLines)
    .trim()
    .max(max, `must be at most ${max} characters`)
    .refine((s) => !FORMULA_START.test(s), FORMULA_MESSAGE);

/** An identifier that appears in case files: unit number, engine key, offer key. */
export const keyText = (what: string) => plainText(80).pipe(z.string().min(1, `${what} must not be empty`));

const rowId = (what: string) => z.number(`must be the id of ${what}`).int(`must be the id of ${what}`).positive(`must be the id of ${what}`);
const version = z.number('must be the version you loaded').int().min(1);

// ---------------------------------------------------------------- trucks

export const truckInputSchema = truckSchema
  .pick({ engineHours: true, remainingLifeHours: true, annualHours: true, loadFactor: true, tonnesPerHour: true, fuelBurnLitresPerHour: true })
  .extend({
    unitNumber: keyText('The unit number'),
    payloadClass: plainText(40).default(''),
    engineTypeId: rowId('an engine type of this workspace'),
    repowerOfferId: rowId('a repower offer of this workspace').nullable().default(null),
    notes: plainText(2000).default(''),
  });
export const truckUpdateSchema = truckInputSchema.extend({ version });
export type TruckInput = z.output<typeof truckInputSchema>;
export type TruckFormValues = z.input<typeof truckInputSchema>;

// ---------------------------------------------------------------- engine types

export const engineInputSchema = engineSchema.omit({ id: true }).extend({
  key: keyText('The engine key'),
  name: plainText(200).default(''),
  notes: plainText(2000).default(''),
});
export const engineUpdateSchema = engineInputSchema.extend({ version });
export type EngineInput = z.output<typeof engineInputSchema>;

// ---------------------------------------------------------------- repower offers

const offerBase = repowerOfferSchema.omit({ id: true, engineId: true }).extend({
  key: keyText('The offer key'),
  // Stored as a nullable column: null (or a blank field) = the core credit applies (MODEL.md section 3).
  failedCoreCredit: repowerOfferSchema.shape.failedCoreCredit.unwrap().nullable().default(null),
  supplier: plainText(200).default(''),
  engineTypeId: rowId('an engine type of this workspace'),
  notes: plainText(2000).default(''),
});

// The same rule validateCase applies to both credits: a negative capital cost is refused.
const coreCreditFits = (
  o: { modulePrice: number; installCost: number; coreCredit: number; failedCoreCredit?: number | null },
  ctx: z.RefinementCtx,
) => {
  for (const key of ['coreCredit', 'failedCoreCredit'] as const) {
    const credit = o[key];
    if (typeof credit === 'number' && credit > o.modulePrice + o.installCost) {
      ctx.addIssue({ code: 'custom', path: [key], message: 'must not exceed module price + install cost (the capital cost would be negative)' });
    }
  }
};
export const offerInputSchema = offerBase.superRefine(coreCreditFits);
export const offerUpdateSchema = offerBase.extend({ version }).superRefine(coreCreditFits);
export type OfferInput = z.output<typeof offerInputSchema>;

// ---------------------------------------------------------------- assumption sets

export const assumptionSetInputSchema = z.strictObject({
  name: plainText(120).pipe(z.string().min(1, 'The name must not be empty')),
  notes: plainText(2000).default(''),
  assumptions: assumptionsSchema,
});
export const assumptionSetUpdateSchema = assumptionSetInputSchema.extend({ version });
export type AssumptionSetInput = z.output<typeof assumptionSetInputSchema>;

// ---------------------------------------------------------------- workspace display settings

export const displaySettingsSchema = z.strictObject({
  units: z.enum(['metric', 'us'], 'must be "metric" or "us"').optional(),
  negativeStyle: z.enum(['parentheses', 'minus'], 'must be "parentheses" or "minus"').optional(),
  /** the calendar month (1 = January … 12 = December) the workspace's fiscal year starts in */
  fiscalYearStartMonth: z
    .number({ error: 'must be a number' })
    .int('must be a whole number (1 = January … 12 = December)')
    .min(1, 'must be a month from 1 (January) to 12 (December)')
    .max(12, 'must be a month from 1 (January) to 12 (December)')
    .optional(),
  /** how numbers are typed and imported (lib/number-input.ts) */
  numberFormat: z.enum(NUMBER_FORMATS, 'must be "point" (18,950.5) or "comma" (18.950,5)').optional(),
  /** plan against actual: a truck whose hours or fuel burn stray more than this many percent from the approved case is flagged */
  actualsTolerancePercent: ranged(0.1, 100, '%').optional(),
});

// ---------------------------------------------------------------- case-file upload

/**
 * The register's text rules applied to what a case/1 upload stores: the name
 * (the assumption set's name, at most 120 characters) and every id (engine
 * and offer keys, unit numbers, at most 80). Text is stored as written, so
 * text with spaces around it is refused rather than trimmed (a trimmed id
 * would no longer match the references to it).
 */
export function caseFileTextProblems(c: {
  name: string;
  engines: { id: string }[];
  repowerOffers: { id: string }[];
  trucks: { id: string }[];
}): { path: string; message: string }[] {
  const problems: { path: string; message: string }[] = [];
  const check = (schema: z.ZodType<string>, value: string, path: string) => {
    const r = schema.safeParse(value);
    if (!r.success) for (const issue of r.error.issues) problems.push({ path, message: issue.message });
    else if (r.data !== value) problems.push({ path, message: 'must not start or end with spaces' });
  };
  check(assumptionSetInputSchema.shape.name, c.name, 'name');
  for (const list of ['engines', 'repowerOffers', 'trucks'] as const) {
    c[list].forEach((x, i) => check(keyText('The id'), x.id, `${list}[${i}].id`));
  }
  return problems;
}
