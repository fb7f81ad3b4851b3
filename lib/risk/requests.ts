/**
 * From validated request bodies to engine calls: driver ids and truck ids are
 * checked against the case, values against each driver's valid range, and
 * every problem is reported at once (422) before anything is computed.
 */
import { invalid, type Problem } from '@/lib/http';
import {
  breakEvens,
  DEFAULT_RANGES,
  DRIVER_CATALOGUE,
  driverId,
  driverLabel,
  getDriver,
  listDrivers,
  makeEvaluator,
  parseDriverId,
  realisticRange,
  spider,
  spiderRealistic,
  tornado,
  twoWay,
  type DriverRef,
  type Metric,
} from '@/lib/engine/sensitivity';
import type { PolicyKey } from '@/lib/engine/types';
import type { TimingSpec } from '@/lib/engine/timing';
import type { CaseFile } from '@/lib/validation/case';
import type { MetricInput } from '@/lib/validation/risk';
import type { z } from 'zod';
import type { breakEvenRequestSchema, monteCarloRequestSchema, spiderRequestSchema, tornadoRequestSchema, twoWayRequestSchema } from '@/lib/validation/risk';

/** A driver id that names a real driver of this case, or a problem at `path`. */
function resolveDriver(c: CaseFile, id: string, path: string, problems: Problem[]): DriverRef | null {
  try {
    const d = parseDriverId(id);
    getDriver(c, d); // throws when the target id is not in the case
    return d;
  } catch (err) {
    problems.push({ path, message: err instanceof Error ? err.message : 'unknown driver' });
    return null;
  }
}

function checkInRange(d: DriverRef, value: number, path: string, problems: Problem[]): void {
  const { min, max } = DRIVER_CATALOGUE[d.key];
  if (value < min || value > max) problems.push({ path, message: `must be between ${min} and ${max} for ${driverLabel(d)}` });
}

/** The policy of each truck in the case's proposal (lib/cases/proposal.ts), given to the `proposal` metric. */
export type Proposal = { readonly policies: Readonly<Record<string, PolicyKey>>; readonly timings?: Readonly<Record<string, TimingSpec>> };

/** Does the request's metric need the case's proposal (so the route evaluates the plan first)? */
export function needsProposal(m: MetricInput): boolean {
  return m.kind === 'proposal';
}

function checkMetric(c: CaseFile, m: MetricInput, problems: Problem[], proposal: Proposal | null): Metric {
  if (m.kind === 'truck-delta' && !c.trucks.some((t) => t.id === m.truckId)) {
    problems.push({ path: 'metric.truckId', message: `no truck "${m.truckId}" in this case` });
  }
  if (m.kind === 'proposal') {
    if (!proposal) throw new Error('the proposal metric needs the case\'s proposal'); // a route that forgot needsProposal
    return { kind: 'proposal', policies: proposal.policies, timings: proposal.timings ?? {} };
  }
  return m;
}

function driversOf(c: CaseFile, metric: Metric, ids: string[] | undefined, problems: Problem[]): DriverRef[] {
  if (!ids) return listDrivers(c, metric.kind === 'truck-delta' && c.trucks.some((t) => t.id === metric.truckId) ? metric.truckId : undefined);
  return ids.map((id, i) => resolveDriver(c, id, `drivers[${i}]`, problems)).filter((d): d is DriverRef => d !== null);
}

function done(problems: Problem[]): void {
  if (problems.length) throw invalid(problems);
}

/** Drivers of a metric with base value, label and unit, for the screens. */
export function describeDrivers(c: CaseFile, truckId?: string) {
  return listDrivers(c, truckId).map((d) => ({
    id: driverId(d),
    label: driverLabel(d),
    unit: DRIVER_CATALOGUE[d.key].unit.replace('USD', c.currency),
    base: getDriver(c, d),
    min: DRIVER_CATALOGUE[d.key].min,
    max: Number.isFinite(DRIVER_CATALOGUE[d.key].max) ? DRIVER_CATALOGUE[d.key].max : null,
    realistic: realisticRange(d, getDriver(c, d)),
    rangeSource: DEFAULT_RANGES[d.key].source,
  }));
}

export function runTornado(c: CaseFile, proposal: Proposal | null, body: z.infer<typeof tornadoRequestSchema>) {
  const problems: Problem[] = [];
  const metric = checkMetric(c, body.metric, problems, proposal);
  const drivers = driversOf(c, metric, body.drivers, problems);
  for (const [id, r] of Object.entries(body.ranges)) {
    const d = resolveDriver(c, id, `ranges.${id}`, problems);
    if (d) {
      checkInRange(d, r.low, `ranges.${id}.low`, problems);
      checkInRange(d, r.high, `ranges.${id}.high`, problems);
    }
  }
  done(problems);
  const ev = makeEvaluator(c, metric);
  return { metric, baseValue: ev.baseValue, rows: tornado(ev, drivers, body.ranges, (body.mode ?? (body.relative !== undefined ? 'relative' : 'realistic')) === 'realistic' ? 'realistic' : (body.relative ?? 0.2)) };
}

export function runSpider(c: CaseFile, proposal: Proposal | null, body: z.infer<typeof spiderRequestSchema>) {
  const problems: Problem[] = [];
  const metric = checkMetric(c, body.metric, problems, proposal);
  const drivers = driversOf(c, metric, body.drivers, problems);
  done(problems);
  const ev = makeEvaluator(c, metric);
  return { metric, baseValue: ev.baseValue, lines: (body.mode ?? (body.changes ? 'relative' : 'realistic')) === 'realistic' ? spiderRealistic(ev, drivers) : spider(ev, drivers, body.changes) };
}

export function runBreakEven(c: CaseFile, proposal: Proposal | null, body: z.infer<typeof breakEvenRequestSchema>) {
  const problems: Problem[] = [];
  const metric = checkMetric(c, body.metric, problems, proposal);
  const drivers = driversOf(c, metric, body.drivers, problems);
  const ranges: Record<string, [number, number]> = {};
  for (const [id, r] of Object.entries(body.ranges)) {
    const d = resolveDriver(c, id, `ranges.${id}`, problems);
    if (d) {
      checkInRange(d, r[0], `ranges.${id}[0]`, problems);
      checkInRange(d, r[1], `ranges.${id}[1]`, problems);
      ranges[driverId(d)] = r;
    }
  }
  done(problems);
  const ev = makeEvaluator(c, metric);
  return { metric, baseValue: ev.baseValue, rows: breakEvens(ev, drivers, ranges) };
}

export function runTwoWay(c: CaseFile, proposal: Proposal | null, body: z.infer<typeof twoWayRequestSchema>) {
  const problems: Problem[] = [];
  const metric = checkMetric(c, body.metric, problems, proposal);
  const row = resolveDriver(c, body.row, 'row', problems);
  const column = resolveDriver(c, body.column, 'column', problems);
  if (row && column && driverId(row) === driverId(column)) problems.push({ path: 'column', message: 'choose two different drivers' });
  if (row) body.rowValues?.forEach((v, i) => checkInRange(row, v, `rowValues[${i}]`, problems));
  if (column) body.columnValues?.forEach((v, i) => checkInRange(column, v, `columnValues[${i}]`, problems));
  done(problems);
  const ev = makeEvaluator(c, metric);
  return { metric, baseValue: ev.baseValue, table: twoWay(ev, row!, column!, body.rowValues, body.columnValues) };
}

/** Iterations × trucks a run may hold: each keeps three npvs (8 bytes each) until it is summarised, so about 72 MB. */
export const MAX_TRUCK_ITERATIONS = 3_000_000;

/** Checks a Monte Carlo request against the case: known drivers, each once, bounds inside the driver's range, a size the server can hold. */
export function checkMonteCarlo(c: CaseFile, body: z.infer<typeof monteCarloRequestSchema>): void {
  const problems: Problem[] = [];
  if (body.measure === 'truck-delta' && body.truckId !== undefined && !c.trucks.some((t) => t.id === body.truckId)) {
    problems.push({ path: 'truckId', message: `no truck "${body.truckId}" in this case` });
  }
  if (body.iterations * c.trucks.length > MAX_TRUCK_ITERATIONS) {
    const most = Math.floor(MAX_TRUCK_ITERATIONS / c.trucks.length);
    problems.push({ path: 'iterations', message: `must be at most ${most.toLocaleString('en-US')} for ${c.trucks.length} trucks (iterations × trucks up to ${MAX_TRUCK_ITERATIONS.toLocaleString('en-US')})` });
  }
  const seen = new Set<string>();
  body.distributions.forEach((entry, i) => {
    const path = `distributions[${i}]`;
    const d = resolveDriver(c, entry.driver, `${path}.driver`, problems);
    if (!d) return;
    const id = driverId(d);
    if (seen.has(id)) problems.push({ path: `${path}.driver`, message: `${driverLabel(d)} is listed twice` });
    seen.add(id);
    const dist = entry.distribution;
    if (dist.kind !== 'fixed') {
      checkInRange(d, dist.min, `${path}.distribution.min`, problems);
      checkInRange(d, dist.max, `${path}.distribution.max`, problems);
    }
  });
  done(problems);
}
