/**
 * What every policy of one truck shares: the time grid (MODEL.md section 2),
 * discount factors, price indices and the calibrated fuel burn (section 4).
 * Built once per truck, then read by the three policy runs.
 */
import type { Assumptions, CaseFileInput, Depreciation, Engine, RepowerOffer, Truck } from '@/lib/validation/case';
import { calibrationFactor, modelledBurnLitresPerHour, powerDemandKw } from './fuel';
import { ZERO } from './time-value';

/** Assumptions with every default filled in (MODEL.md defaults). */
export interface ResolvedAssumptions extends Omit<Assumptions, 'depreciation'> {
  depreciation: Depreciation;
}

/** A repower offer with its defaults: `failedCoreCredit` is the `coreCredit` unless given. */
export interface ResolvedOffer extends RepowerOffer {
  failedCoreCredit: number;
}

export interface TruckSetup {
  truck: Truck;
  a: ResolvedAssumptions;
  start: Engine;
  offer: ResolvedOffer;
  next: Engine;
  /** N: years in the horizon */
  n: number;
  /** H_y for y = 0..N (H_0 = 0) */
  hours: Float64Array;
  /** the truck figures the hours were computed from (a reused setup keeps its hours while they hold) */
  hoursFrom: Pick<Truck, 'annualHours' | 'remainingLifeHours'>;
  /** by period, read for y = 0..N only (shared tables may be longer) */
  discountFactor: Float64Array;
  /** DF_y · (fuel + carbon price of a litre in year y): the present value of burning one litre then */
  energyCost: Float64Array;
  fuelIndex: Float64Array;
  carbonIndex: Float64Array;
  generalIndex: Float64Array;
  powerKw: number;
  calibration: number;
  burnStart: number;
  burnNext: number;
}

/** Case input (possibly without its defaulted fields) → assumptions with defaults. */
export function resolveAssumptions(input: CaseFileInput['assumptions']): ResolvedAssumptions {
  const dep = input.depreciation;
  return {
    ...input,
    timing: input.timing ?? 'end-of-year',
    horizonYears: input.horizonYears ?? null,
    rebuildAccounting: input.rebuildAccounting ?? 'expense',
    valuation: input.valuation ?? 'expected',
    lostMarginShare: input.lostMarginShare ?? 1,
    depreciation: dep.method === 'declining-balance' ? { ...dep, factor: dep.factor ?? 2 } : (dep as Depreciation),
  };
}

export function resolveOffer(input: CaseFileInput['repowerOffers'][number]): ResolvedOffer {
  return {
    ...input,
    productivityGain: input.productivityGain ?? 0,
    timing: input.timing ?? 'at-overhaul',
    failedCoreCredit: input.failedCoreCredit ?? input.coreCredit,
  };
}

/** A truck with its defaults; the input itself when it already has them (no copy per evaluation). */
export function resolveTruck(input: CaseFileInput['trucks'][number]): Truck {
  if (input.fuelBurnLitresPerHour !== undefined) return input as Truck;
  return { ...input, fuelBurnLitresPerHour: null };
}

/**
 * Years in a truck's horizon: N = ceil(remainingLifeHours / annualHours),
 * capped by horizonYears when set. Hours left over in a last year below
 * 1e-6 count as zero (so 18,000 / 6,000 is 3 years even after rounding).
 *
 * @example horizonYears(55000, 6200, null) // = 9
 */
export function horizonYears(remainingLifeHours: number, annualHours: number, cap: number | null): number {
  const whole = Math.floor(remainingLifeHours / annualHours);
  const leftover = remainingLifeHours - whole * annualHours;
  const n = Math.max(1, leftover < ZERO ? whole : whole + 1);
  return cap == null ? n : Math.min(n, cap);
}

/**
 * Price index of year y for growth g: 1 in period 0, (1+g)^(y−1) in year y ≥ 1
 * (case prices are year-1 prices).
 *
 * @example priceIndex(0.025, 3) // = 1.025² = 1.050625
 */
export function priceIndex(growth: number, period: number): number {
  return period === 0 ? 1 : Math.pow(1 + growth, period - 1);
}

/**
 * Discount factors and price indices by period 0..n. They depend on the
 * assumptions alone, not on the truck, so one table serves every truck of a
 * case (a truck reads its first N + 1 entries).
 */
export interface YearTables {
  discountFactor: Float64Array;
  /** DF_y · (fuelPrice·fuelIndex_y + co2KgPerLitre/1000 · carbonPrice·carbonIndex_y) */
  energyCost: Float64Array;
  fuelIndex: Float64Array;
  carbonIndex: Float64Array;
  generalIndex: Float64Array;
}

export function buildYearTables(a: ResolvedAssumptions, n: number): YearTables {
  // typed arrays: one element kind for every table, so the hot loops' loads stay monomorphic
  const discountFactor = new Float64Array(n + 1);
  const energyCost = new Float64Array(n + 1);
  const fuelIndex = new Float64Array(n + 1);
  const carbonIndex = new Float64Array(n + 1);
  const generalIndex = new Float64Array(n + 1);
  const half = a.timing === 'mid-year' ? 0.5 : 0;
  for (let y = 0; y <= n; y++) {
    discountFactor[y] = y === 0 ? 1 : Math.pow(1 + a.discountRate, -(y - half));
    fuelIndex[y] = priceIndex(a.fuelEscalation, y);
    carbonIndex[y] = priceIndex(a.carbonEscalation, y);
    generalIndex[y] = priceIndex(a.inflation, y);
    energyCost[y] = discountFactor[y] * (a.fuelPrice * fuelIndex[y] + (a.co2KgPerLitre / 1000) * a.carbonPrice * carbonIndex[y]);
  }
  return { discountFactor, energyCost, fuelIndex, carbonIndex, generalIndex };
}

/** N of a truck under the assumptions (see `horizonYears`). */
export function truckHorizon(truck: Pick<Truck, 'remainingLifeHours' | 'annualHours'>, a: ResolvedAssumptions): number {
  return horizonYears(truck.remainingLifeHours, truck.annualHours, a.horizonYears);
}

/** Year tables long enough for every truck of a case. */
export function buildCaseYearTables(a: ResolvedAssumptions, trucks: readonly Pick<Truck, 'remainingLifeHours' | 'annualHours'>[]): YearTables {
  let longest = 1;
  for (const t of trucks) longest = Math.max(longest, truckHorizon(t, a));
  return buildYearTables(a, longest);
}

/**
 * A truck's setup. `tables`, when given, must be built from the same
 * assumptions and reach at least period N; the setup then shares them (its
 * arrays may be longer than N + 1: readers stop at N). `previous`, a setup of
 * the same truck from an earlier evaluation, is refilled and returned instead
 * of a new object (Monte Carlo: one per truck for a whole run), and keeps its
 * hours when they would be the same numbers.
 */
export function buildTruckSetup(
  truck: Truck,
  a: ResolvedAssumptions,
  engines: ReadonlyMap<string, Engine>,
  offers: ReadonlyMap<string, ResolvedOffer>,
  tables?: YearTables,
  previous?: TruckSetup,
): TruckSetup {
  const start = engines.get(truck.engineId);
  const offer = offers.get(truck.repowerOfferId);
  const next = offer && engines.get(offer.engineId);
  if (!start || !offer || !next) throw new Error(`truck ${truck.id}: unknown engine or repower offer`);

  const n = truckHorizon(truck, a);
  // the same hours as the previous setup of this truck when its hours and N have not moved
  // (Monte Carlo: a typed array per truck and iteration is mostly allocator work)
  const same =
    previous !== undefined && previous.n === n &&
    previous.hoursFrom.annualHours === truck.annualHours && previous.hoursFrom.remainingLifeHours === truck.remainingLifeHours;
  const hours = same ? previous.hours : new Float64Array(n + 1);
  if (!same) {
    for (let y = 0; y <= n; y++) {
      hours[y] = y === 0 ? 0 : Math.max(0, Math.min(truck.annualHours, truck.remainingLifeHours - (y - 1) * truck.annualHours));
    }
  }
  const years = tables && tables.discountFactor.length > n ? tables : buildYearTables(a, n);

  const powerKw = powerDemandKw(truck.loadFactor, start.ratedKw);
  const modelledStart = modelledBurnLitresPerHour(powerKw, start.bsfcGPerKwh, a.fuelDensityKgPerL);
  const calibration = calibrationFactor(truck.fuelBurnLitresPerHour, modelledStart);
  const burnStart = calibration * modelledStart;
  const burnNext = calibration * modelledBurnLitresPerHour(powerKw, next.bsfcGPerKwh, a.fuelDensityKgPerL);

  const hoursFrom = same ? previous.hoursFrom : { annualHours: truck.annualHours, remainingLifeHours: truck.remainingLifeHours };
  if (previous === undefined) {
    return {
      truck, a, start, offer, next, n, hours, hoursFrom,
      discountFactor: years.discountFactor, energyCost: years.energyCost, fuelIndex: years.fuelIndex, carbonIndex: years.carbonIndex, generalIndex: years.generalIndex,
      powerKw, calibration, burnStart, burnNext,
    };
  }
  const s = previous;
  s.truck = truck;
  s.a = a;
  s.start = start;
  s.offer = offer;
  s.next = next;
  s.n = n;
  s.hours = hours;
  s.hoursFrom = hoursFrom;
  s.discountFactor = years.discountFactor;
  s.energyCost = years.energyCost;
  s.fuelIndex = years.fuelIndex;
  s.carbonIndex = years.carbonIndex;
  s.generalIndex = years.generalIndex;
  s.powerKw = powerKw;
  s.calibration = calibration;
  s.burnStart = burnStart;
  s.burnNext = burnNext;
  return s;
}
