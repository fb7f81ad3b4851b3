/**
 * The `case/1` file format (MODEL.md section 10) as zod schemas, and
 * `validateCase`, which reports every problem of a case at once (MODEL.md
 * section 9): its JSON path (`trucks[3].annualHours`) and a plain reason.
 *
 * The sub-schemas are exported for the fleet-register forms.
 */
import { z } from '@/lib/validation/zod';
import { crossFieldProblems, orderProblems, plainProblems, type CaseProblem } from './case-checks';

export { formatPath, type CaseProblem } from './case-checks';

// ---------------------------------------------------------------- number kinds

/**
 * Every number of a case has a finite range (docs/methodology.md, "Input
 * limits", gives each with its reason). The ranges are generous for any real
 * haul truck and engine, and they bound the engine's work: at most 100 years,
 * at most 500,000 h a truck, an event no more often than every ~240 h.
 */
const fmt = (v: number) => v.toLocaleString('en-US', { maximumFractionDigits: 6 });
const unitText = (unit: string) => (unit ? ` ${unit}` : '');
/** A number in [min, max] (or (min, max] when `above`), with the range in the message. */
export const ranged = (min: number, max: number, unit = '', above = false) => {
  const n = z.number('must be a finite number');
  const low = above
    ? n.gt(min, `must be greater than ${fmt(min)}${unitText(unit)}`)
    : n.min(min, min === 0 ? 'must not be negative' : `must be at least ${fmt(min)}${unitText(unit)}`);
  return low.max(max, `must be at most ${fmt(max)}${unitText(unit)}`);
};

/**
 * Largest money amount: 10 billion per amount (a module, an overhaul, a
 * price). Sums of thousands of such amounts stay far below 2^53, so the totals
 * are finite and exact to the cent in double precision.
 */
export const MAX_MONEY = 1e10;
/** Most days down for one event: a year. */
export const MAX_DAYS_DOWN = 365;
/** A money amount in the case's currency, 0 to MAX_MONEY. */
const money = () => ranged(0, MAX_MONEY);
/** Days down for one event, 0 to a year. */
const daysDown = () => ranged(0, MAX_DAYS_DOWN, 'days');
/** A growth rate: prices must stay positive; a fall of half or a doubling a year is the widest we accept. */
const growthRate = () =>
  z.number('must be a finite number').gt(-0.5, 'must be greater than -0.5 (-50 % a year)').max(1, 'must be at most 1 (+100 % a year)');

/** How failures enter the figures (MODEL.md section 11). */
export const VALUATIONS = ['expected', 'median-path'] as const;
export type Valuation = (typeof VALUATIONS)[number];

export const MACRS_YEARS = [3, 5, 7, 10, 15, 20] as const;
/** Longest horizon the engine accepts (our choice: keeps (1+i)^N finite on the IRR grid). */
export const MAX_HORIZON_YEARS = 100;
/** Longest tax life of a depreciation schedule, in years. */
export const MAX_DEPRECIATION_YEARS = 100;
/** Largest declining-balance factor (10: a thousand per cent declining balance). */
export const MAX_DECLINING_FACTOR = 10;

/** Engine and truck ranges that the engine (and the expected valuation) rely on. */
export const LIMITS = {
  weibullShape: { min: 0.5, max: 20 },
  weibullScaleHours: { min: 500, max: 1_000_000 },
  lifeHours: { min: 500, max: 200_000 },
  serviceIntervalHours: { min: 10, max: 100_000 },
  engineHours: { min: 0, max: 1_000_000 },
  /** above 0 */
  remainingLifeHours: { min: 0, max: 500_000 },
  annualHours: { min: 1, max: 8784 },
} as const;

/**
 * Longest lists a case file may hold (docs/methodology.md, "Input limits"):
 * as many trucks as the fleet import takes in one file, and engine types and
 * offers far beyond any fleet's. Checked before the schema looks at the items,
 * so an upload of a million trucks is refused in one line, not a million.
 */
export const CASE_LIST_LIMITS = { engines: 1_000, repowerOffers: 1_000, trucks: 10_000 } as const;

const listMax = (key: keyof typeof CASE_LIST_LIMITS, what: string) =>
  [CASE_LIST_LIMITS[key], `must list at most ${CASE_LIST_LIMITS[key].toLocaleString('en-US')} ${what}`] as const;

/** The lists longer than CASE_LIST_LIMITS, each a problem at its path. */
function listLengthProblems(input: unknown): CaseProblem[] {
  if (!input || typeof input !== 'object') return [];
  const words = { engines: 'engines', repowerOffers: 'repower offers', trucks: 'trucks' } as const;
  return (Object.keys(CASE_LIST_LIMITS) as Array<keyof typeof CASE_LIST_LIMITS>).flatMap((key) => {
    const list = (input as Record<string, unknown>)[key];
    if (!Array.isArray(list) || list.length <= CASE_LIST_LIMITS[key]) return [];
    return [{ path: key, message: `${listMax(key, words[key])[1]}; this file lists ${list.length.toLocaleString('en-US')}` }];
  });
}

const depYears = () =>
  z
    .number('must be a finite number')
    .int('must be a whole number of years')
    .min(1, 'must be at least 1')
    .max(MAX_DEPRECIATION_YEARS, `must be at most ${MAX_DEPRECIATION_YEARS} years`);

// ---------------------------------------------------------------- depreciation

export const depreciationSchema = z.discriminatedUnion('method', [
  z.strictObject({
    method: z.literal('none'),
    // tolerated so a form can keep the years it showed before the switch; ignored
    years: depYears().optional(),
  }),
  z.strictObject({
    method: z.literal('straight-line'),
    years: depYears(),
  }),
  z.strictObject({
    method: z.literal('declining-balance'),
    years: depYears(),
    factor: ranged(0, MAX_DECLINING_FACTOR, '', true).default(2),
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
    .number('must be a finite number')
    .gt(-0.99, 'must be greater than -0.99 (-99 %)')
    .max(1, 'must be at most 1 (100 %)'),
  timing: z.enum(['end-of-year', 'mid-year']).default('end-of-year'),
  horizonYears: z
    .number('must be a finite number')
    .int('must be a whole number of years')
    .min(1, 'must be at least 1')
    .max(MAX_HORIZON_YEARS, `must be at most ${MAX_HORIZON_YEARS} years`)
    .nullable()
    .default(null),
  inflation: growthRate(),
  fuelPrice: money(),
  fuelEscalation: growthRate(),
  fuelDensityKgPerL: ranged(0.3, 1.5, 'kg/L'),
  co2KgPerLitre: ranged(0, 10, 'kg/L'),
  lubePrice: money(),
  labourRate: money(),
  carbonPrice: money(),
  carbonEscalation: growthRate(),
  marginPerTonne: money(),
  taxRate: z.number('must be a finite number').min(0, 'must be at least 0').lt(1, 'must be below 1 (100 %)'),
  depreciation: depreciationSchema,
  rebuildAccounting: z.enum(['expense', 'capitalise']).default('expense'),
  /** MODEL.md section 11: the expectation over failure ages (default) or the median path */
  valuation: z.enum(VALUATIONS, 'must be "expected" or "median-path"').default('expected'),
  /** MODEL.md section 5: the share of a day down's margin that is really lost (0: a standby truck covers it) */
  lostMarginShare: ranged(0, 1, '(100 %)').default(1),
});

const hours = (key: keyof typeof LIMITS) => ranged(LIMITS[key].min, LIMITS[key].max, 'hours');

export const engineSchema = z.strictObject({
  id: z.string().min(1, 'must not be empty'),
  ratedKw: ranged(1, 10_000, 'kW'),
  bsfcGPerKwh: ranged(50, 1000, 'g/kWh'),
  lifeHours: hours('lifeHours'),
  weibullShape: ranged(LIMITS.weibullShape.min, LIMITS.weibullShape.max),
  weibullScaleHours: hours('weibullScaleHours'),
  overhaulCost: money(),
  overhaulDowntimeDays: daysDown(),
  failureCost: money(),
  failureDowntimeDays: daysDown(),
  serviceIntervalHours: hours('serviceIntervalHours'),
  sumpLitres: ranged(0, 10_000, 'litres'),
  serviceKitCost: money(),
  serviceLabourHours: ranged(0, 1000, 'hours'),
  topUpLitresPerHour: ranged(0, 100, 'litres per hour'),
});

export const repowerOfferSchema = z.strictObject({
  id: z.string().min(1, 'must not be empty'),
  engineId: z.string().min(1, 'must not be empty'),
  modulePrice: money(),
  installCost: money(),
  coreCredit: money(),
  /** credit for a core that failed in service (a repower brought forward by a failure); default: coreCredit */
  failedCoreCredit: money().optional(),
  downtimeDays: daysDown(),
  productivityGain: ranged(0, 1, '(+100 %)').default(0),
  timing: z.enum(['at-overhaul', 'now']).default('at-overhaul'),
});

export const truckSchema = z.strictObject({
  id: z.string().min(1, 'must not be empty'),
  engineId: z.string().min(1, 'must not be empty'),
  repowerOfferId: z.string().min(1, 'must not be empty'),
  engineHours: hours('engineHours'),
  remainingLifeHours: ranged(LIMITS.remainingLifeHours.min, LIMITS.remainingLifeHours.max, 'hours', true),
  annualHours: z
    .number('must be a finite number')
    .min(LIMITS.annualHours.min, 'must be at least 1 hour')
    .max(LIMITS.annualHours.max, 'must be at most 8784 hours (the hours in a leap year)'),
  loadFactor: z.number('must be a finite number').gt(0, 'must be greater than 0').max(1, 'must be at most 1 (a fraction of rated power)'),
  tonnesPerHour: ranged(0, 100_000, 'tonnes per hour', true),
  fuelBurnLitresPerHour: ranged(0, 10_000, 'litres per hour', true).nullable().default(null),
});

export const caseSchema = z.strictObject({
  format: z.literal('case/1', 'must be "case/1"'),
  name: z.string().min(1, 'must not be empty'),
  currency: z.string().regex(/^[A-Z]{3}$/, 'must be a three-letter ISO 4217 code such as USD'),
  assumptions: assumptionsSchema,
  engines: z.array(engineSchema).min(1, 'must list at least one engine').max(...listMax('engines', 'engines')),
  repowerOffers: z.array(repowerOfferSchema).max(...listMax('repowerOffers', 'repower offers')),
  trucks: z.array(truckSchema).min(1, 'must list at least one truck').max(...listMax('trucks', 'trucks')),
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
  const tooLong = listLengthProblems(input);
  if (tooLong.length) return { ok: false, problems: tooLong };
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
