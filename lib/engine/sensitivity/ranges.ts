/**
 * Realistic default ranges: for each driver, the low and high a finance reader
 * would call plausible for a surface-mine haul fleet, used by the tornado and
 * the spider unless the user asks for the uniform ±x % or types a range.
 *
 * Forms (value = the driver's value in the case, v):
 * - `relative`: [v·(1 + low), v·(1 + high)] — money, hours, days, BSFC;
 * - `points`:   [v + low, v + high], rates and shares as fractions (0.03 = 3 percentage points);
 * - `zero`:     an absolute [low, high] used instead when v is 0 (carbon price, productivity gain):
 *               a relative range around 0 is no range at all.
 * Every end is then clipped to the driver's valid range (DRIVER_CATALOGUE, the case's own limits).
 *
 * Sources are marked "common practice" (ranges analysts routinely use in
 * capital cases of this kind) or "from memory" (figures recalled, not looked
 * up in a named publication); none is a measurement.
 *
 * @example realisticRange({ key: 'discountRate' }, 0.08) // [0.05, 0.11]: ±3 percentage points
 * @example realisticRange({ key: 'carbonPrice' }, 0)     // [0, 200]: absolute, the base being 0
 */
import { clampDriver, DRIVER_CATALOGUE, type DriverKey, type DriverRef } from './drivers';

export interface DefaultRange {
  form: 'relative' | 'points';
  low: number;
  high: number;
  /** absolute [low, high] used when the driver's value in the case is 0 */
  zero?: readonly [number, number];
  /** where the range comes from: "common practice" or "from memory", with the reasoning */
  source: string;
}

const rel = (low: number, high: number, source: string, zero?: readonly [number, number]): DefaultRange => ({ form: 'relative', low, high, source, ...(zero ? { zero } : {}) });
const pp = (low: number, high: number, source: string): DefaultRange => ({ form: 'points', low, high, source });

/** The realistic default range of every driver. */
export const DEFAULT_RANGES: Record<DriverKey, DefaultRange> = {
  fuelPrice: rel(-0.25, 0.25, 'common practice: delivered diesel has moved by about a quarter within a year or two'),
  fuelEscalation: pp(-0.02, 0.02, 'common practice: ±2 percentage points a year on the escalation'),
  discountRate: pp(-0.03, 0.03, 'common practice: ±3 percentage points around the hurdle rate'),
  inflation: pp(-0.02, 0.02, 'common practice: ±2 percentage points a year'),
  marginPerTonne: rel(-0.3, 0.3, 'common practice: ±30 % for a commodity margin over a cycle'),
  taxRate: pp(-0.05, 0.05, 'from memory: corporate rates of mining jurisdictions differ by a few points'),
  carbonPrice: rel(-0.5, 1, 'from memory: traded and shadow carbon prices have halved and doubled within a few years; 0 to 200 per t CO2 where the case has none', [0, 200]),
  lostMarginShare: pp(-0.25, 0.25, 'common practice: a quarter of the lost margin may be recovered elsewhere in the fleet'),
  modulePrice: rel(-0.1, 0.2, 'common practice: a quoted module price, with room for escalation before delivery'),
  installCost: rel(-0.2, 0.4, 'common practice: installation work overruns more often than it underruns'),
  coreCredit: rel(-0.5, 0.2, 'from memory: core credits are cut when the returned engine is inspected'),
  failedCoreCredit: rel(-0.5, 0.2, 'from memory: as the core credit, a failed core often earns little'),
  downtimeDays: rel(-0.25, 0.5, 'common practice: a swap takes longer when parts or crews are late'),
  productivityGain: rel(-0.5, 0.5, 'from memory: a claimed gain may be half or one and a half times real; 0 to 5 % where the case has none', [0, 0.05]),
  overhaulCost: rel(-0.15, 0.3, 'common practice: rebuild quotes grow once the engine is opened'),
  failureCost: rel(-0.3, 0.5, 'common practice: the cost of an in-service failure varies with the damage'),
  overhaulDowntimeDays: rel(-0.25, 0.5, 'common practice: as the swap'),
  failureDowntimeDays: rel(-0.3, 1, 'common practice: an unplanned failure may wait for an engine or parts'),
  bsfcGPerKwh: rel(-0.03, 0.05, 'from memory: large high-speed diesels quote about 195–215 g/kWh at rated load; in service a few % worse with wear and part load, a few % better rarely'),
  lifeHours: rel(-0.2, 0.2, 'common practice: ±20 % on the planned life to overhaul'),
  weibullScaleHours: rel(-0.25, 0.25, 'from memory: fitted Weibull scales of engine fleets differ by about a quarter'),
  weibullShape: rel(-0.3, 0.3, 'from memory: fitted wear-out shapes of about 2 to 4 are uncertain by about a third'),
  annualHours: rel(-0.1, 0.05, 'common practice: hours fall more easily (weather, pit changes) than they rise'),
  loadFactor: rel(-0.15, 0.15, 'common practice: ±15 % on the average load with haul profile changes'),
};

/** The drivers whose range has an absolute form for a value of 0. */
export const ZERO_BASE_DRIVERS = (Object.keys(DEFAULT_RANGES) as DriverKey[]).filter((k) => DEFAULT_RANGES[k].zero);

/** The realistic [low, high] of a driver whose value in the case is `base`, clipped to its valid range. */
export function realisticRange(d: DriverRef, base: number): [number, number] {
  const r = DEFAULT_RANGES[d.key];
  let lo: number;
  let hi: number;
  if (base === 0 && r.zero) [lo, hi] = r.zero;
  else if (r.form === 'points') [lo, hi] = [base + r.low, base + r.high];
  else [lo, hi] = [base * (1 + r.low), base * (1 + r.high)];
  if (lo > hi) [lo, hi] = [hi, lo]; // a negative base turns a relative range round
  return [clampDriver(d, lo), clampDriver(d, hi)];
}

/** The uniform range: ±`relative` of the base (an absolute zero-base range where the base is 0), clipped. */
export function uniformRange(d: DriverRef, base: number, relative: number): [number, number] {
  const zero = DEFAULT_RANGES[d.key].zero;
  if (base === 0 && zero) return [clampDriver(d, zero[0]), clampDriver(d, zero[1])];
  return [clampDriver(d, base * (1 - relative)), clampDriver(d, base * (1 + relative))];
}

/** Whether a driver is a rate or share (a fraction shown in %), whose changes read in percentage points. */
export function isRateDriver(key: DriverKey): boolean {
  return DRIVER_CATALOGUE[key].unit.includes('%');
}
