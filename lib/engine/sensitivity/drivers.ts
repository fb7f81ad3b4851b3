/**
 * Drivers: the inputs a finance reader questions (issue 7), each readable and
 * settable on a case. A driver targets the case's assumptions, one engine,
 * one offer or one truck by id, or every truck at once ("*"): then its value
 * is the mean over the trucks and setting it scales each truck by the same
 * factor (so the fleet's spread of annual hours is kept).
 */
import type { CaseFileInput } from '@/lib/validation/case';
import { touchesAnyTruck } from './touched';

export type DriverScope = 'assumption' | 'engine' | 'offer' | 'truck';

export interface DriverInfo {
  scope: DriverScope;
  label: string;
  unit: string;
  /** values the analyses may use: [min, max]. Wider than the case would refuse is not allowed; the
   * lower ends of hours and Weibull figures are kept well above 0 on purpose, since an engine life of
   * a few hours would mean millions of events a year, which is no question a reader asks. */
  min: number;
  max: number;
}

// The case file's own ranges (lib/validation/case.ts, docs/methodology.md "Input limits"), repeated here
// because this module stays free of the schemas (a test checks every end validates).
const MAX_MONEY = 1e10;
const money = (label: string, unit = 'USD'): Omit<DriverInfo, 'scope'> => ({ label, unit, min: 0, max: MAX_MONEY });
const DAYS = 365;

/** Every driver key, its scope, label, unit and valid range. Currency units are filled in by the screens. */
export const DRIVER_CATALOGUE = {
  fuelPrice: { scope: 'assumption', ...money('Fuel price', 'USD/L') },
  fuelEscalation: { scope: 'assumption', label: 'Fuel escalation', unit: '%/yr', min: -0.49, max: 1 },
  discountRate: { scope: 'assumption', label: 'Discount rate', unit: '%', min: -0.98, max: 1 },
  inflation: { scope: 'assumption', label: 'Inflation', unit: '%/yr', min: -0.49, max: 1 },
  marginPerTonne: { scope: 'assumption', ...money('Margin per tonne', 'USD/t') },
  taxRate: { scope: 'assumption', label: 'Tax rate', unit: '%', min: 0, max: 0.99 },
  carbonPrice: { scope: 'assumption', ...money('Carbon price', 'USD/t CO2') },
  lostMarginShare: { scope: 'assumption', label: 'Share of lost margin', unit: '%', min: 0, max: 1 },
  modulePrice: { scope: 'offer', ...money('Module price') },
  installCost: { scope: 'offer', ...money('Install cost') },
  coreCredit: { scope: 'offer', ...money('Core credit') },
  failedCoreCredit: { scope: 'offer', ...money('Failed core credit') },
  downtimeDays: { scope: 'offer', label: 'Days down for swap', unit: 'days', min: 0, max: DAYS },
  productivityGain: { scope: 'offer', label: 'Productivity gain', unit: '%', min: 0, max: 1 },
  overhaulCost: { scope: 'engine', ...money('Overhaul cost') },
  failureCost: { scope: 'engine', ...money('Failure cost') },
  overhaulDowntimeDays: { scope: 'engine', label: 'Days down, overhaul', unit: 'days', min: 0, max: DAYS },
  failureDowntimeDays: { scope: 'engine', label: 'Days down, failure', unit: 'days', min: 0, max: DAYS },
  bsfcGPerKwh: { scope: 'engine', label: 'BSFC', unit: 'g/kWh', min: 50, max: 1000 },
  lifeHours: { scope: 'engine', label: 'Planned life', unit: 'h', min: 500, max: 200_000 },
  weibullScaleHours: { scope: 'engine', label: 'Weibull scale', unit: 'h', min: 500, max: 1_000_000 },
  weibullShape: { scope: 'engine', label: 'Weibull shape', unit: '', min: 0.5, max: 20 },
  annualHours: { scope: 'truck', label: 'Annual hours', unit: 'h/yr', min: 100, max: 8784 },
  loadFactor: { scope: 'truck', label: 'Load factor', unit: '%', min: 0.01, max: 1 },
} as const satisfies Record<string, DriverInfo>;

export type DriverKey = keyof typeof DRIVER_CATALOGUE;
export const DRIVER_KEYS = Object.keys(DRIVER_CATALOGUE) as DriverKey[];

/** A driver on a case: the key, and for engine, offer and truck keys the id it acts on ("*" = all trucks). */
export interface DriverRef {
  key: DriverKey;
  target?: string;
}

export function driverId(d: DriverRef): string {
  return d.target ? `${d.key}@${d.target}` : d.key;
}

export function parseDriverId(id: string): DriverRef {
  const at = id.indexOf('@');
  const key = (at < 0 ? id : id.slice(0, at)) as DriverKey;
  if (!(key in DRIVER_CATALOGUE)) throw new RangeError(`unknown driver "${id}"`);
  return at < 0 ? { key } : { key, target: id.slice(at + 1) };
}

type Row = Record<string, unknown>;

/** The objects of the case the driver acts on (one, or every truck for "*"). */
function targets(c: CaseFileInput, d: DriverRef): Row[] {
  const info = DRIVER_CATALOGUE[d.key];
  if (info.scope === 'assumption') return [c.assumptions as Row];
  const list = (info.scope === 'engine' ? c.engines : info.scope === 'offer' ? c.repowerOffers : c.trucks) as Row[];
  if (info.scope === 'truck' && d.target === '*') return list;
  const found = list.filter((r) => r.id === d.target);
  if (found.length === 0) throw new RangeError(`driver ${driverId(d)}: no ${info.scope} with id "${d.target ?? ''}"`);
  return found;
}

/**
 * Optional fields with a model default, read as the engine reads them when the
 * case leaves them out (MODEL.md sections 3 and 5): productivityGain 0,
 * lostMarginShare 1, failedCoreCredit the offer's coreCredit. Setting one of
 * them writes it into the case, so from then on it no longer follows the default.
 */
const DEFAULTS: Partial<Record<string, (row: Row) => number>> = {
  productivityGain: () => 0,
  lostMarginShare: () => 1,
  failedCoreCredit: (row) => numberOf(row, 'coreCredit'),
};

const numberOf = (row: Row, key: string): number => {
  const v = row[key];
  if (typeof v === 'number') return v;
  const fallback = DEFAULTS[key];
  return fallback ? fallback(row) : 0;
};

/** The driver's value in a case (the mean over the trucks for "*"). */
export function getDriver(c: CaseFileInput, d: DriverRef): number {
  const rows = targets(c, d);
  let sum = 0;
  for (const r of rows) sum += numberOf(r, d.key);
  return sum / rows.length;
}

/**
 * Set a driver on `work` (a clone of `base`), computed from `base` so that
 * repeated sets never drift: one target takes the value; "*" scales every
 * truck by value / base mean (or sets each to the value when that mean is 0).
 */
export function setDriver(work: CaseFileInput, base: CaseFileInput, d: DriverRef, value: number): void {
  const out = targets(work, d);
  if (out.length === 1) {
    out[0][d.key] = value;
    return;
  }
  const from = targets(base, d);
  const mean = getDriver(base, d);
  for (let i = 0; i < out.length; i++) out[i][d.key] = mean === 0 ? value : numberOf(from[i], d.key) * (value / mean);
}

/** Clamp a value into the driver's valid range. */
export function clampDriver(d: DriverRef, value: number): number {
  const { min, max } = DRIVER_CATALOGUE[d.key];
  return Math.min(max, Math.max(min, value));
}

/** A deep copy of a case that setDriver may change (case files are plain JSON). */
export function cloneCase(c: CaseFileInput): CaseFileInput {
  return JSON.parse(JSON.stringify(c)) as CaseFileInput;
}

/**
 * The drivers worth showing for a metric: the assumptions, then for one truck
 * its own figures, its engine, its offer and the offer's engine; for the fleet,
 * every engine and offer of the case and the trucks' figures as "*".
 * A driver that touches no truck of the case (an engine type or offer no
 * truck uses: `touchesAnyTruck` in touched.ts) is left out, since it cannot
 * move any figure.
 */
export function listDrivers(c: CaseFileInput, truckId?: string): DriverRef[] {
  const out: DriverRef[] = [];
  const of = (scope: DriverScope) => DRIVER_KEYS.filter((k) => DRIVER_CATALOGUE[k].scope === scope);
  for (const key of of('assumption')) out.push({ key });
  let engineIds = c.engines.map((e) => e.id);
  let offerIds = c.repowerOffers.map((o) => o.id);
  if (truckId !== undefined) {
    const t = c.trucks.find((x) => x.id === truckId);
    if (!t) throw new RangeError(`no truck with id "${truckId}"`);
    const offer = c.repowerOffers.find((o) => o.id === t.repowerOfferId);
    offerIds = offer ? [offer.id] : [];
    engineIds = [t.engineId, ...(offer ? [offer.engineId] : [])];
  } else {
    const used = new Set(c.trucks.flatMap((t) => [t.engineId, c.repowerOffers.find((o) => o.id === t.repowerOfferId)?.engineId ?? '']));
    const usedOffers = new Set(c.trucks.map((t) => t.repowerOfferId));
    engineIds = engineIds.filter((id) => used.has(id));
    offerIds = offerIds.filter((id) => usedOffers.has(id));
  }
  for (const id of offerIds) for (const key of of('offer')) out.push({ key, target: id });
  for (const id of engineIds) for (const key of of('engine')) out.push({ key, target: id });
  for (const key of of('truck')) out.push({ key, target: truckId ?? '*' });
  return out.filter((d) => touchesAnyTruck(c, d));
}

/** A readable name: "Module price (kestrel-km2700)". */
export function driverLabel(d: DriverRef): string {
  const info = DRIVER_CATALOGUE[d.key];
  if (!d.target) return info.label;
  return `${info.label} (${d.target === '*' ? 'all trucks' : d.target})`;
}
