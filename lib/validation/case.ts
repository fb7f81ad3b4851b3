/**
 * The `case/1` file format (MODEL.md section 10) as zod schemas, and
 * `validateCase`, which reports every problem of a case at once (MODEL.md
 * section 9): its JSON path (`trucks[3].annualHours`) and a plain reason.
 *
 * The sub-schemas are exported for the fleet-register forms.
 */
import { z } from 'zod';

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

export interface CaseProblem {
  /** JSON path such as `trucks[3].annualHours`; `(root)` for the whole case. */
  path: string;
  message: string;
}

export type CaseValidation = { ok: true; value: CaseFile } | { ok: false; problems: CaseProblem[] };

/** `['trucks', 3, 'annualHours']` → `trucks[3].annualHours`. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    if (typeof key === 'number') out += `[${key}]`;
    else out += out === '' ? String(key) : `.${String(key)}`;
  }
  return out === '' ? '(root)' : out;
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = root;
  for (const key of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[key];
  }
  return v;
}

function describe(v: unknown): string {
  if (v === null) return 'null';
  if (Array.isArray(v)) return 'a list';
  if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
  if (typeof v === 'string') return 'text';
  return typeof v === 'object' ? 'an object' : typeof v;
}

const EXPECTED_WORDS: Record<string, string> = {
  number: 'a finite number',
  int: 'a whole number',
  string: 'text',
  object: 'an object',
  array: 'a list',
  boolean: 'true or false',
};

function plainProblems(input: unknown, issue: z.core.$ZodIssue): CaseProblem[] {
  const path = issue.path as PropertyKey[];
  switch (issue.code) {
    case 'unrecognized_keys':
      return issue.keys.map((k) => ({ path: formatPath([...path, k]), message: 'unknown field' }));
    case 'invalid_type': {
      const got = valueAt(input, path);
      if (got === undefined) return [{ path: formatPath(path), message: 'is required' }];
      const want = EXPECTED_WORDS[issue.expected] ?? issue.expected;
      return [{ path: formatPath(path), message: `must be ${want}, not ${describe(got)}` }];
    }
    case 'invalid_value':
      if (issue.message.startsWith('must')) return [{ path: formatPath(path), message: issue.message }];
      return [
        {
          path: formatPath(path),
          message: `must be one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}`,
        },
      ];
    case 'invalid_union': {
      const options = (issue as { options?: unknown[] }).options;
      if (options) {
        const got = valueAt(input, path);
        if (got === undefined) return [{ path: formatPath(path), message: 'is required' }];
        return [{ path: formatPath(path), message: `must be one of ${options.map((o) => JSON.stringify(o)).join(', ')}` }];
      }
      return [{ path: formatPath(path), message: issue.message }];
    }
    default:
      return [{ path: formatPath(path), message: issue.message }];
  }
}

function asArray(v: unknown): unknown[] {
  return Array.isArray(v) ? v : [];
}
function idOf(v: unknown): string | undefined {
  if (v && typeof v === 'object' && typeof (v as { id?: unknown }).id === 'string') return (v as { id: string }).id;
  return undefined;
}
function fieldOf(v: unknown, key: string): unknown {
  return v && typeof v === 'object' ? (v as Record<string, unknown>)[key] : undefined;
}

/**
 * Checks that need more than one field: duplicate ids, references to ids that
 * do not exist, and a core credit larger than the module and its install.
 * Works on the raw input so these problems are reported alongside the schema's.
 */
function crossFieldProblems(input: unknown): CaseProblem[] {
  const problems: CaseProblem[] = [];
  const engines = asArray(fieldOf(input, 'engines'));
  const offers = asArray(fieldOf(input, 'repowerOffers'));
  const trucks = asArray(fieldOf(input, 'trucks'));

  const collectIds = (list: unknown[], name: string): Set<string> => {
    const seen = new Map<string, number>();
    list.forEach((item, i) => {
      const id = idOf(item);
      if (id === undefined) return;
      const first = seen.get(id);
      if (first !== undefined) {
        problems.push({ path: `${name}[${i}].id`, message: `duplicate id "${id}" (already used by ${name}[${first}])` });
      } else seen.set(id, i);
    });
    return new Set(seen.keys());
  };
  const engineIds = collectIds(engines, 'engines');
  const offerIds = collectIds(offers, 'repowerOffers');
  collectIds(trucks, 'trucks');

  offers.forEach((offer, i) => {
    const ref = fieldOf(offer, 'engineId');
    if (typeof ref === 'string' && ref !== '' && !engineIds.has(ref)) {
      problems.push({ path: `repowerOffers[${i}].engineId`, message: `no engine has the id "${ref}"` });
    }
    const price = fieldOf(offer, 'modulePrice');
    const install = fieldOf(offer, 'installCost');
    const core = fieldOf(offer, 'coreCredit');
    if ([price, install, core].every((n) => typeof n === 'number' && Number.isFinite(n))) {
      if ((core as number) > (price as number) + (install as number)) {
        problems.push({
          path: `repowerOffers[${i}].coreCredit`,
          message: 'must not exceed modulePrice + installCost (the capital cost would be negative)',
        });
      }
    }
  });
  const cap = fieldOf(fieldOf(input, 'assumptions'), 'horizonYears');
  trucks.forEach((truck, i) => {
    const life = fieldOf(truck, 'remainingLifeHours');
    const annual = fieldOf(truck, 'annualHours');
    if (cap == null && typeof life === 'number' && typeof annual === 'number' && life > 0 && annual > 0) {
      if (life / annual > MAX_HORIZON_YEARS) {
        problems.push({
          path: `trucks[${i}].remainingLifeHours`,
          message: `gives more than ${MAX_HORIZON_YEARS} years at the truck's annual hours; set assumptions.horizonYears`,
        });
      }
    }
    const eng = fieldOf(truck, 'engineId');
    if (typeof eng === 'string' && eng !== '' && !engineIds.has(eng)) {
      problems.push({ path: `trucks[${i}].engineId`, message: `no engine has the id "${eng}"` });
    }
    const off = fieldOf(truck, 'repowerOfferId');
    if (typeof off === 'string' && off !== '' && !offerIds.has(off)) {
      problems.push({ path: `trucks[${i}].repowerOfferId`, message: `no repower offer has the id "${off}"` });
    }
  });
  return problems;
}

function pathOrder(p: string): (string | number)[] {
  return p.split(/[.[\]]+/).filter(Boolean).map((s) => (/^\d+$/.test(s) ? Number(s) : s));
}

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
  problems.push(...crossFieldProblems(input));
  if (problems.length === 0 && parsed.success) return { ok: true, value: parsed.data };

  // one line per path and reason, in document order
  const seen = new Set<string>();
  const unique = problems.filter((p) => {
    const key = `${p.path}\u0000${p.message}`;
    if (seen.has(key)) return false;
    seen.add(key);
    return true;
  });
  const order = ['format', 'name', 'currency', 'assumptions', 'engines', 'repowerOffers', 'trucks'];
  unique.sort((a, b) => {
    const pa = pathOrder(a.path);
    const pb = pathOrder(b.path);
    const ra = order.indexOf(String(pa[0]));
    const rb = order.indexOf(String(pb[0]));
    if (ra !== rb) return (ra < 0 ? 99 : ra) - (rb < 0 ? 99 : rb);
    const ia = typeof pa[1] === 'number' ? pa[1] : -1;
    const ib = typeof pb[1] === 'number' ? pb[1] : -1;
    return ia - ib;
  });
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
