/**
 * The `case/1` file format (MODEL.md section 10) as zod schemas, and
 * `validateCase`, which reports every problem of a case at once (MODEL.md
 * section 9): its JSON path (`trucks[3].annualHours`) and a plain reason.
 *
 * The sub-schemas are exported for the fleet-register forms.
 */
import { z } from 'zod';
import { crossFieldProblems, orderProblems, plainProblems, type CaseProblem } from './case-checks';

export { formatPath, type CaseProblem } from './case-checks';

// ---------------------------------------------------------------- number kinds

/** A cost, price, amount or count that may be zero but not negative. */
const nonNegative = () => z.number().min(0, 'must not be negative');
/** A quantity that must be above zero (life, interval, Weibull parameters, hours, kW …). */
const positive = () => z.number().gt(0, 'must be greater than 0');
/** A growth rate: prices must stay positive, so above −100 %. */
const growthRate = () => z.number().gt(-1, 'must be greater than -1 (-100 %)');

export const MACRS_YEARS = [3, 5, 7, 10, 15, 20] as const;
/** Longest horizon the engine accepts (our choice: keeps (1+i)^N finite on the IRR grid). */
export const MAX_HORIZON_YEARS = 100;

// ---------------------------------------------------------------- depreciation

export const depreciationSchema = z.discriminatedUnion('method', [
  z.strictObject({
    method: z.literal('none'),
    // tolerated so a form can keep the years it showed before the switch; ignored
    years: z.number().int('must be a whole number of years').min(1, 'must be at least 1').optional(),
  }),
  z.strictObject({
    method: z.literal('straight-line'),
    years: z.number().int('must be a whole number of years').min(1, 'must be at least 1'),
  }),
  z.strictObject({
    method: z.literal('declining-balance'),
    years: z.number().int('must be a whole number of years').min(1, 'must be at least 1'),
    factor: positive().default(2),
  }),
  z.strictObject({
    method: z.literal('macrs'),
    years: z
      .number()
      .refine((v) => (MACRS_YEARS as readonly number[]).includes(v), 'must be one of 3, 5, 7, 10, 15 or 20 for MACRS'),
  }),
]);

// ---------------------------------------------------------------- entities

export const assumptionsSchema = z.strictObject({
  discountRate: z
    .number()
    .gt(-0.99, 'must be greater than -0.99 (-99 %)')
    .max(1, 'must be at most 1 (100 %)'),
  timing: z.enum(['end-of-year', 'mid-year']).default('end-of-year'),
  horizonYears: z
    .number()
    .int('must be a whole number of years')
    .min(1, 'must be at least 1')
    .max(MAX_HORIZON_YEARS, `must be at most ${MAX_HORIZON_YEARS}`)
    .nullable()
    .default(null),
  inflation: growthRate(),
  fuelPrice: nonNegative(),
  fuelEscalation: growthRate(),
  fuelDensityKgPerL: positive(),
  co2KgPerLitre: nonNegative(),
  lubePrice: nonNegative(),
  labourRate: nonNegative(),
  carbonPrice: nonNegative(),
  carbonEscalation: growthRate(),
  marginPerTonne: nonNegative(),
  taxRate: z.number().min(0, 'must be at least 0').lt(1, 'must be below 1 (100 %)'),
  depreciation: depreciationSchema,
  rebuildAccounting: z.enum(['expense', 'capitalise']).default('expense'),
});

export const engineSchema = z.strictObject({
  id: z.string().min(1, 'must not be empty'),
  ratedKw: positive(),
  bsfcGPerKwh: positive(),
  lifeHours: positive(),
  weibullShape: positive(),
  weibullScaleHours: positive(),
  overhaulCost: nonNegative(),
  overhaulDowntimeDays: nonNegative(),
  failureCost: nonNegative(),
  failureDowntimeDays: nonNegative(),
  serviceIntervalHours: positive(),
  sumpLitres: nonNegative(),
  serviceKitCost: nonNegative(),
  serviceLabourHours: nonNegative(),
  topUpLitresPerHour: nonNegative(),
});

export const repowerOfferSchema = z.strictObject({
  id: z.string().min(1, 'must not be empty'),
  engineId: z.string().min(1, 'must not be empty'),
  modulePrice: nonNegative(),
  installCost: nonNegative(),
  coreCredit: nonNegative(),
  downtimeDays: nonNegative(),
  productivityGain: nonNegative().default(0),
  timing: z.enum(['at-overhaul', 'now']).default('at-overhaul'),
});

export const truckSchema = z.strictObject({
  id: z.string().min(1, 'must not be empty'),
  engineId: z.string().min(1, 'must not be empty'),
  repowerOfferId: z.string().min(1, 'must not be empty'),
  engineHours: nonNegative(),
  remainingLifeHours: positive(),
  annualHours: positive().max(8784, 'must be at most 8784 (the hours in a leap year)'),
  loadFactor: positive().max(1, 'must be at most 1 (a fraction of rated power)'),
  tonnesPerHour: positive(),
  fuelBurnLitresPerHour: positive().nullable().default(null),
});

export const caseSchema = z.strictObject({
  format: z.literal('case/1', 'must be "case/1"'),
  name: z.string().min(1, 'must not be empty'),
  currency: z.string().regex(/^[A-Z]{3}$/, 'must be a three-letter ISO 4217 code such as USD'),
  assumptions: assumptionsSchema,
  engines: z.array(engineSchema).min(1, 'must list at least one engine'),
  repowerOffers: z.array(repowerOfferSchema),
  trucks: z.array(truckSchema).min(1, 'must list at least one truck'),
});

/** A valid case with defaults filled in (what `validateCase` returns). */
export type CaseFile = z.output<typeof caseSchema>;
/** A case as written in a file: defaulted fields may be absent. */
export type CaseFileInput = z.input<typeof caseSchema>;
export type Assumptions = z.output<typeof assumptionsSchema>;
export type Depreciation = z.output<typeof depreciationSchema>;
export type Engine = z.output<typeof engineSchema>;
export type RepowerOffer = z.output<typeof repowerOfferSchema>;
export type Truck = z.output<typeof truckSchema>;

// ---------------------------------------------------------------- validateCase


export type CaseValidation = { ok: true; value: CaseFile } | { ok: false; problems: CaseProblem[] };

/**
 * Validate a `case/1` document. Every problem is reported at once, each with
 * its JSON path and a plain reason; nothing is computed from an invalid case.
 *
 * @example
 * validateCase({ format: 'case/1' }) // → { ok: false, problems: [{ path: 'name', message: 'is required' }, …] }
 */
export function validateCase(input: unknown): CaseValidation {
  const parsed = caseSchema.safeParse(input);
  const problems: CaseProblem[] = [];
  if (!parsed.success) {
    for (const issue of parsed.error.issues) problems.push(...plainProblems(input, issue));
  }
  problems.push(...crossFieldProblems(input, MAX_HORIZON_YEARS));
  if (problems.length === 0 && parsed.success) return { ok: true, value: parsed.data };

  const unique = orderProblems(problems);
  return { ok: false, problems: unique };
}

/** Thrown by the engine when asked to evaluate a case that does not validate. */
export class CaseValidationError extends Error {
  readonly problems: CaseProblem[];
  constructor(problems: CaseProblem[]) {
    super(`invalid case: ${problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`);
    this.name = 'CaseValidationError';
    this.problems = problems;
  }
}
