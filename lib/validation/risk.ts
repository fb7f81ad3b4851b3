/**
 * Request bodies of the sensitivity and Monte Carlo endpoints. Driver ids
 * ("fuelPrice", "modulePrice@offer-id", "annualHours@*") are checked against
 * the case on the server (lib/risk/requests.ts), since only it knows the ids.
 */
import { z } from '@/lib/validation/zod';

/** A driver value: finite and within ±1e12 here; the server then checks it against the driver's own range (lib/risk/requests.ts). */
const finite = () =>
  z
    .number('must be a finite number')
    .min(-1e12, 'must be at least -1,000,000,000,000')
    .max(1e12, 'must be at most 1,000,000,000,000');

export const metricSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('truck-delta'), truckId: z.string().min(1, 'choose a truck') }),
  z.strictObject({ kind: z.literal('fleet-delta') }),
  z.strictObject({ kind: z.literal('fleet-best') }),
  // the case's proposal against rebuilding every engine; the server fills in its policies from the saved plan
  z.strictObject({ kind: z.literal('proposal') }),
]);

const driverIdSchema = z.string().min(1).max(200);

export const tornadoRequestSchema = z.strictObject({
  metric: metricSchema,
  drivers: z.array(driverIdSchema).max(200).optional(),
  /** realistic (the default without `relative`): each driver's realistic default range (lib/engine/sensitivity/ranges.ts);
   * relative (the default with `relative`): ±`relative` (default 0.2) on every driver */
  mode: z.enum(['realistic', 'relative'], 'must be realistic or relative').optional(),
  relative: z.number().gt(0, 'must be above 0').lt(1, 'must be below 1 (100 %)').optional(),
  ranges: z
    .record(driverIdSchema, z.strictObject({ low: finite(), high: finite() }).refine((r) => r.low <= r.high, 'low must not exceed high'))
    .default({}),
});

export const spiderRequestSchema = z.strictObject({
  metric: metricSchema,
  drivers: z.array(driverIdSchema).max(200).optional(),
  /** realistic (the default without `changes`): points across each driver's realistic range; relative: fractional changes (the default with `changes`) */
  mode: z.enum(['realistic', 'relative'], 'must be realistic or relative').optional(),
  changes: z.array(z.number().min(-0.9, 'must be at least -0.9 (-90 %)').max(2, 'must be at most 2 (+200 %)')).min(2).max(21).optional(),
});

export const breakEvenRequestSchema = z.strictObject({
  metric: metricSchema.refine((m) => m.kind !== 'fleet-best', 'break-even needs a ΔNPV metric (proposal, fleet-delta or truck-delta)'),
  drivers: z.array(driverIdSchema).max(200).optional(),
  ranges: z
    .record(driverIdSchema, z.tuple([finite(), finite()]).refine(([a, b]) => a < b, 'the range must run from a lower to a higher value'))
    .default({}),
});

export const twoWayRequestSchema = z.strictObject({
  metric: metricSchema,
  row: driverIdSchema,
  column: driverIdSchema,
  rowValues: z.array(finite()).min(2).max(12).optional(),
  columnValues: z.array(finite()).min(2).max(12).optional(),
});

export const distributionSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('fixed') }),
  z.strictObject({ kind: z.literal('uniform'), min: finite(), max: finite() }).refine((d) => d.min <= d.max, 'min must not exceed max'),
  z
    .strictObject({ kind: z.literal('triangular'), min: finite(), mode: finite(), max: finite() })
    .refine((d) => d.min <= d.mode && d.mode <= d.max, 'must have min ≤ mode ≤ max'),
  z
    .strictObject({ kind: z.literal('normal'), mean: finite(), sd: finite().min(0, 'sd must not be negative'), min: finite(), max: finite() })
    .refine((d) => d.min <= d.max, 'min must not exceed max'),
]);

export const MAX_ITERATIONS = 100_000;

export const monteCarloRequestSchema = z
  .strictObject({
    iterations: z.number().int('must be a whole number').min(10, 'must be at least 10').max(MAX_ITERATIONS, `must be at most ${MAX_ITERATIONS}`),
    seed: z.number().int('must be a whole number').min(0, 'must not be negative').max(2 ** 31 - 1, 'must be below 2,147,483,648'),
    sampleFailures: z.boolean().default(true),
    distributions: z.array(z.strictObject({ driver: driverIdSchema, distribution: distributionSchema })).max(200).default([]),
    /** the figure the run is read on (lib/risk/measures.ts); default the proposal; truck-delta names its truck */
    measure: z.enum(['proposal', 'fleet-delta', 'fleet-best', 'truck-delta'], 'must be proposal, fleet-delta, fleet-best or truck-delta').default('proposal'),
    truckId: z.string().min(1).max(200).optional(),
  })
  .refine((r) => (r.measure === 'truck-delta') === (r.truckId !== undefined), { path: ['truckId'], message: 'name a truck for the truck-delta measure, and only for it' });

export type MetricInput = z.infer<typeof metricSchema>;
export type MonteCarloRequest = z.infer<typeof monteCarloRequestSchema>;
export type DistributionInput = z.infer<typeof distributionSchema>;

/**
 * A Monte Carlo run's id in the URL (`…/monte-carlo/[job]`): the UUID the run
 * was stored under (lib/risk/runs.ts, `randomUUID`, lower-case hex). Anything
 * else names no run (`readParams`: 404).
 */
export const runIdParam = z.string().regex(/^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/, 'must be a run id');

/** PUT …/pinned-run: the run to pin and the case version the caller loaded. */
export const pinRunSchema = z.strictObject({
  runId: z.string('must be a run id').min(1, 'choose a run').max(36, 'must be a run id'),
  version: z.number('must be the version you loaded').int('must be a whole number').min(1, 'must be at least 1').max(1e12, 'must be at most 1,000,000,000,000'),
});
