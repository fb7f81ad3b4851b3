/**
 * An INDEPENDENT, plain and slow implementation of MODEL.md sections 2–8 for
 * one truck and one policy, given the failure age of every engine life.
 *
 * Written from the text of /work/shared/MODEL.md only: it imports nothing
 * from `lib/engine` (only the case/1 types and `validateCase`), so it can
 * check the engine. Each rule below names the MODEL section it comes from.
 * Speed is no goal: one object per period, every amount booked where it
 * falls, tax computed at the end from the per-period tallies.
 *
 * Tolerance (MODEL.md preamble, "ZERO"): two ages (hours) within 1e-6 h are
 * the same age; so a failure age within 1e-6 h of the planned life is the
 * planned event, an event within 1e-6 h of a year's last hour falls at that
 * hour, and an engine within 1e-6 h of its planned life at the start is "at"
 * its life.
 *
 * @example
 * const p = referencePath(oneTruck, 'T-01', 'rebuild', medianAge);
 * p.periods[1].overhauls // the overhaul category of year 1 (negative: a cost)
 */
import {
  validateCase,
  type CaseFile,
  type CaseFileInput,
  type Depreciation,
  type Engine,
  type RepowerOffer,
  type Truck,
} from '@/lib/validation/case';

/** Hours closer than this are the same hour (MODEL.md preamble, ε = 1e-6 on a path). */
export const AGE_EPS = 1e-6;

export type RefPolicy = 'keep' | 'rebuild' | 'repower';
export const REF_POLICIES: readonly RefPolicy[] = ['keep', 'rebuild', 'repower'];

/**
 * Failure age (engine hours) of one engine life: `lifeIndex` 0 for the engine
 * fitted at the start (then 1, 2, … after each event), `engine` the engine
 * type of that life, `startAge` its age when the life starts (the truck's
 * engine hours for life 0, else 0). Must exceed `startAge`.
 */
export type AgeSource = (lifeIndex: number, engine: Engine, startAge: number) => number;

/** MODEL.md section 8, `breakdown`: the categories, signed as cash. */
export const REF_CATEGORIES = [
  'fuel',
  'carbon',
  'lube',
  'overhauls',
  'failures',
  'capital',
  'lostMargin',
  'extraMargin',
  'taxEffect',
  'residual',
] as const;
export type RefCategory = (typeof REF_CATEGORIES)[number];

/** Per-period quantities (MODEL.md section 8: fuelLitres, co2Tonnes, tonnes, hours are their sums). */
export const REF_QUANTITIES = ['fuelLitres', 'co2Tonnes', 'tonnes', 'hours'] as const;
export type RefQuantity = (typeof REF_QUANTITIES)[number];

export const REF_EVENT_KINDS = ['overhauls', 'repairs', 'repowers'] as const;
export type RefEventKind = (typeof REF_EVENT_KINDS)[number];

export type RefPeriod = Record<RefCategory, number> &
  Record<RefQuantity, number> & {
    period: number;
    cashFlow: number;
    events: Record<RefEventKind, number>;
    /** oil services booked in the period (for reading; not compared) */
    oilServices: number;
  };

export interface RefPath {
  horizonYears: number;
  periods: RefPeriod[];
  /** Σ CF_y · DF_y (MODEL.md section 8) */
  npv: number;
  /** 1 when the first life ended in service by a failure (or a failed swap) within the horizon, else 0 */
  failureBeforePlanned: number;
  totals: Record<RefQuantity, number>;
}

// ------------------------------------------------------------ depreciation

/**
 * MACRS, GDS, half-year convention: IRS Publication 946 "How To Depreciate
 * Property", Appendix A, Table A-1 (3-, 5-, 7-, 10-, 15- and 20-Year
 * Property, Half-Year Convention), percentages as printed (n + 1 entries).
 * Written down from memory of that table, not copied from a fetched copy:
 * each column sums to 100 (a test checks it), and the engine's own table
 * agrees on every class the reference tests exercise (3, 5, 7, 20 years by
 * name, 10 and 15 in the random cases); check against the printed table
 * before relying on it elsewhere.
 */
export const REF_MACRS_PERCENT: Record<number, readonly number[]> = {
  3: [33.33, 44.45, 14.81, 7.41],
  5: [20.0, 32.0, 19.2, 11.52, 11.52, 5.76],
  7: [14.29, 24.49, 17.49, 12.49, 8.93, 8.92, 8.93, 4.46],
  10: [10.0, 18.0, 14.4, 11.52, 9.22, 7.37, 6.55, 6.55, 6.56, 6.55, 3.28],
  15: [5.0, 9.5, 8.55, 7.7, 6.93, 6.23, 5.9, 5.9, 5.91, 5.9, 5.91, 5.9, 5.91, 5.9, 5.91, 2.95],
  20: [
    3.75, 7.219, 6.677, 6.177, 5.713, 5.285, 4.888, 4.522, 4.462, 4.461, 4.462, 4.461, 4.462, 4.461, 4.462, 4.461,
    4.462, 4.461, 4.462, 4.461, 2.231,
  ],
};

/** D_1, D_2, … of a spend (MODEL.md section 6); [] for `none`. */
export function refDepreciationSchedule(amount: number, dep: Depreciation): number[] {
  switch (dep.method) {
    case 'none':
      return [];
    case 'straight-line': {
      const out: number[] = [];
      for (let j = 1; j <= dep.years; j++) out.push(amount / dep.years);
      return out;
    }
    case 'declining-balance': {
      // D_j = max(B_{j−1}·factor/n, B_{j−1}/(n−j+1)); never more than the basis left
      // (MODEL.md is silent on factor > n; a schedule cannot depreciate more than the spend).
      const n = dep.years;
      const factor = dep.factor ?? 2;
      let basis = amount;
      const out: number[] = [];
      for (let j = 1; j <= n; j++) {
        const d = Math.min(basis, Math.max((basis * factor) / n, basis / (n - j + 1)));
        out.push(d);
        basis -= d;
      }
      return out;
    }
    case 'macrs': {
      const table = REF_MACRS_PERCENT[dep.years];
      if (!table) throw new Error(`no MACRS table for ${dep.years} years`);
      return table.map((pct) => (amount * pct) / 100);
    }
  }
}

// ------------------------------------------------------------ helpers

/** Validated cases by input object (a sampler runs thousands of paths of one case: validate it once). */
const validated = new WeakMap<object, CaseFile>();
function valid(input: CaseFileInput | CaseFile): CaseFile {
  const known = validated.get(input);
  if (known) return known;
  const v = validateCase(input);
  if (!v.ok) throw new Error(`reference: invalid case: ${v.problems.map((p) => `${p.path}: ${p.message}`).join('; ')}`);
  validated.set(input, v.value);
  return v.value;
}

function byId<T extends { id: string }>(list: T[], id: string, what: string): T {
  const found = list.find((x) => x.id === id);
  if (!found) throw new Error(`reference: no ${what} "${id}"`);
  return found;
}

/** Number of multiples of `interval` in (a1, a2], ages within AGE_EPS being equal. */
function multiplesIn(a1: number, a2: number, interval: number): number {
  return Math.max(0, Math.floor((a2 + AGE_EPS) / interval) - Math.floor((a1 + AGE_EPS) / interval));
}

/** Whether `a` is (within AGE_EPS) a positive multiple of `interval`. */
function isMultiple(a: number, interval: number): boolean {
  const k = Math.round(a / interval);
  return k >= 1 && Math.abs(k * interval - a) <= AGE_EPS;
}

/** MODEL.md section 2: N = ceil(remaining / annual), capped by horizonYears. */
export function refHorizonYears(c: CaseFile, truck: Truck): number {
  // A last year of less than AGE_EPS hours is no year (MODEL.md preamble: an amount below ε counts as zero).
  let n = Math.ceil(truck.remainingLifeHours / truck.annualHours);
  if (n > 1 && truck.remainingLifeHours - (n - 1) * truck.annualHours <= AGE_EPS) n -= 1;
  return c.assumptions.horizonYears == null ? n : Math.min(n, c.assumptions.horizonYears);
}

/** Median failure age (MODEL.md section 3): η((a0/η)^β + ln 2)^(1/β); a0 = 0 gives η(ln 2)^(1/β). */
export function refMedianAge(engine: Engine, startAge: number): number {
  const b = engine.weibullShape;
  const eta = engine.weibullScaleHours;
  return eta * Math.pow(Math.pow(startAge / eta, b) + Math.LN2, 1 / b);
}

/** The median path's age source (MODEL.md section 3). */
export const medianAges: AgeSource = (_lifeIndex, engine, startAge) => refMedianAge(engine, startAge);

// ------------------------------------------------------------ the path

/**
 * One path of one truck under one policy (MODEL.md sections 2–8) with the
 * failure ages `ages` gives. The case may be a file (defaults are filled by
 * `validateCase`); its `valuation` is ignored (the ages are given).
 */
export function referencePath(
  caseFile: CaseFileInput | CaseFile,
  truckId: string,
  policy: RefPolicy,
  ages: AgeSource,
  /**
   * repower only: the swap at the k-th planned event of the engine fitted today (lives before the k-th follow the
   * rebuild rule), its life run on `delayHours` past the planned life (issue 15's timing options); default k = 1, 0 h
   */
  timing: { k: number; delayHours: number } = { k: 1, delayHours: 0 },
): RefPath {
  const c = valid(caseFile);
  const as = c.assumptions;
  const truck = byId(c.trucks, truckId, 'truck');
  const e0 = byId(c.engines, truck.engineId, 'engine');
  const offer: RepowerOffer = byId(c.repowerOffers, truck.repowerOfferId, 'repower offer');
  const e1 = byId(c.engines, offer.engineId, 'engine');
  const T = as.taxRate;

  // ---- section 2: time grid and prices
  const N = refHorizonYears(c, truck);
  const hoursOf = (y: number) =>
    y === 0 ? 0 : Math.max(0, Math.min(truck.annualHours, truck.remainingLifeHours - (y - 1) * truck.annualHours));
  const grow = (g: number, y: number) => (y === 0 ? 1 : Math.pow(1 + g, y - 1));
  const general = (y: number) => grow(as.inflation, y);
  const discount = (y: number) =>
    y === 0 ? 1 : Math.pow(1 + as.discountRate, -(as.timing === 'mid-year' ? y - 0.5 : y));

  // ---- section 4: fuel
  const powerKw = truck.loadFactor * e0.ratedKw;
  const modelledBurn = (e: Engine) => (powerKw * e.bsfcGPerKwh) / (1000 * as.fuelDensityKgPerL);
  const k = truck.fuelBurnLitresPerHour == null ? 1 : truck.fuelBurnLitresPerHour / modelledBurn(e0);
  const burn = (e: Engine) => k * modelledBurn(e);

  const periods: RefPeriod[] = [];
  for (let y = 0; y <= N; y++) {
    periods.push({
      period: y,
      fuel: 0,
      carbon: 0,
      lube: 0,
      overhauls: 0,
      failures: 0,
      capital: 0,
      lostMargin: 0,
      extraMargin: 0,
      taxEffect: 0,
      residual: 0,
      cashFlow: 0,
      fuelLitres: 0,
      co2Tonnes: 0,
      tonnes: 0,
      hours: 0,
      oilServices: 0,
      events: { overhauls: 0, repairs: 0, repowers: 0 },
    });
  }
  /** costs deductible in the period (positive), section 6 */
  const deductible = new Array<number>(N + 1).fill(0);
  /** extra margin taxed in the period (positive) */
  const gains = new Array<number>(N + 1).fill(0);
  /** spends that are depreciated, section 6 */
  const spends: { period: number; amount: number }[] = [];

  // ---- section 3: engine state
  const baseTph = truck.tonnesPerHour;
  let engine: Engine = e0;
  let age = truck.engineHours;
  let lifeIndex = 0;
  let failAge = ages(0, e0, age);
  let repowered = false;
  let tph = baseTph;
  let failureBeforePlanned = 0;

  const startLife = (e: Engine) => {
    engine = e;
    age = 0;
    lifeIndex += 1;
    failAge = ages(lifeIndex, e, 0);
  };

  // section 5: days down at the tonnes per hour given, at period y's margin
  const daysDown = (y: number, days: number, rate: number) => {
    const lost = days * (truck.annualHours / 365) * rate * as.marginPerTonne * general(y) * as.lostMarginShare;
    periods[y].lostMargin -= lost;
    deductible[y] += lost;
  };

  const bookOverhaul = (y: number) => {
    const cost = engine.overhaulCost * general(y);
    periods[y].overhauls -= cost;
    if (as.rebuildAccounting === 'expense') deductible[y] += cost;
    else spends.push({ period: y, amount: cost });
    periods[y].events.overhauls += 1;
    daysDown(y, engine.overhaulDowntimeDays, tph);
    startLife(engine);
  };

  const bookRepair = (y: number) => {
    const cost = engine.failureCost * general(y);
    periods[y].failures -= cost;
    if (as.rebuildAccounting === 'expense') deductible[y] += cost;
    else spends.push({ period: y, amount: cost });
    periods[y].events.repairs += 1;
    daysDown(y, engine.failureDowntimeDays, tph);
    startLife(engine);
  };

  const bookRepower = (y: number, unplanned: boolean) => {
    const credit = unplanned ? (offer.failedCoreCredit ?? offer.coreCredit) : offer.coreCredit;
    const capital = (offer.modulePrice + offer.installCost - credit) * general(y);
    periods[y].capital -= capital;
    spends.push({ period: y, amount: capital });
    periods[y].events.repowers += 1;
    // the repower's own days down at the old rate (section 5); a failed swap: the longer downtime (section 3)
    const days = unplanned ? Math.max(offer.downtimeDays, engine.failureDowntimeDays) : offer.downtimeDays;
    daysDown(y, days, tph);
    repowered = true;
    tph = baseTph * (1 + offer.productivityGain);
    startLife(e1);
  };

  // ---- period 0: an engine at or past its planned life has its planned event now; a repower "now"
  const atLifeNow = truck.engineHours >= e0.lifeHours - AGE_EPS;
  if (policy === 'rebuild' && atLifeNow) bookOverhaul(0);
  if (policy === 'repower' && timing.k >= 2 && offer.timing !== 'now' && atLifeNow) bookOverhaul(0);
  else if (policy === 'repower' && (offer.timing === 'now' || truck.engineHours >= e0.lifeHours + timing.delayHours - AGE_EPS)) {
    bookRepower(0, false);
  }

  /** The next event of the engine fitted: its age, and what it is. */
  const nextEvent = (): { at: number; kind: 'overhaul' | 'repair' | 'repower' | 'failed-swap'; failure: boolean } => {
    // the life that the repower ends (the k-th of the engine fitted today) runs `delayHours` past its planned life
    const swapLife = policy === 'repower' && !repowered && lifeIndex + 1 >= timing.k;
    const planned = policy === 'keep' ? Infinity : engine.lifeHours + (swapLife ? timing.delayHours : 0);
    // a failure age equal (within AGE_EPS) to the planned life is the planned event
    const failure = failAge < planned - AGE_EPS;
    const at = failure ? failAge : planned;
    if (swapLife) return { at, kind: failure ? 'failed-swap' : 'repower', failure };
    if (failure) return { at, kind: 'repair', failure };
    return { at, kind: 'overhaul', failure };
  };

  const runSegment = (y: number, hours: number, a1: number, a2: number, endsInEvent: boolean) => {
    const p = periods[y];
    const litres = burn(engine) * hours;
    const co2 = (litres * as.co2KgPerLitre) / 1000;
    p.hours += hours;
    p.fuelLitres += litres;
    p.co2Tonnes += co2;
    const fuelCost = litres * as.fuelPrice * grow(as.fuelEscalation, y);
    const carbonCost = co2 * as.carbonPrice * grow(as.carbonEscalation, y);
    let services = multiplesIn(a1, a2, engine.serviceIntervalHours);
    if (endsInEvent && isMultiple(a2, engine.serviceIntervalHours) && services > 0) services -= 1;
    p.oilServices += services;
    const perService =
      (engine.sumpLitres * as.lubePrice + engine.serviceKitCost + engine.serviceLabourHours * as.labourRate) *
      general(y);
    const topUp = engine.topUpLitresPerHour * hours * as.lubePrice * general(y);
    const lube = services * perService + topUp;
    p.fuel -= fuelCost;
    p.carbon -= carbonCost;
    p.lube -= lube;
    deductible[y] += fuelCost + carbonCost + lube;
    p.tonnes += hours * tph;
    if (repowered && offer.productivityGain !== 0) {
      const extra = hours * baseTph * offer.productivityGain * as.marginPerTonne * general(y);
      p.extraMargin += extra;
      gains[y] += extra;
    }
  };

  // ---- years 1..N
  for (let y = 1; y <= N; y++) {
    const H = hoursOf(y);
    let used = 0;
    for (let guard = 0; ; guard++) {
      if (guard > 100_000) throw new Error('reference: too many events in a year');
      const rest = H - used;
      if (rest <= AGE_EPS) break;
      const ev = nextEvent();
      const dt = Math.max(0, ev.at - age);
      const inside = dt < rest - AGE_EPS;
      const atLastHour = !inside && Math.abs(dt - rest) <= AGE_EPS;
      if (inside || (atLastHour && y < N)) {
        // the event falls in year y (its last hour included), except at the very end of the horizon
        const seg = inside ? dt : rest;
        runSegment(y, seg, age, ev.at, true);
        used += seg;
        age = ev.at;
        if (lifeIndex === 0 && ev.failure) failureBeforePlanned = 1;
        if (ev.kind === 'overhaul') bookOverhaul(y);
        else if (ev.kind === 'repair') bookRepair(y);
        else bookRepower(y, ev.kind === 'failed-swap');
      } else {
        // to the year's end, not at an event (an event due exactly at the last hour of year N does not happen)
        runSegment(y, rest, age, age + rest, false);
        age += rest;
        used = H;
      }
    }
  }

  // ---- section 7: residual credit of the engine fitted at the end of year N
  const credit = engine.overhaulCost * Math.max(0, 1 - age / engine.lifeHours) * general(N);
  periods[N].residual += credit;

  // ---- section 6: tax
  const shield = new Array<number>(N + 1).fill(0);
  if (as.depreciation.method !== 'none') {
    for (const s of spends) {
      const schedule = refDepreciationSchedule(s.amount, as.depreciation);
      const first = Math.max(s.period, 1);
      let done = 0;
      schedule.forEach((d, i) => {
        const year = first + i;
        if (year <= N) {
          shield[year] += T * d;
          done += d;
        }
      });
      // basis not yet depreciated by the end of year N is written off in year N
      shield[N] += T * (s.amount - done);
    }
  }
  for (let y = 0; y <= N; y++) {
    const p = periods[y];
    p.taxEffect = T * deductible[y] - T * gains[y] + shield[y] - (y === N ? T * credit : 0);
    p.cashFlow = REF_CATEGORIES.reduce((sum, cat) => sum + p[cat], 0);
  }

  const npv = periods.reduce((sum, p) => sum + p.cashFlow * discount(p.period), 0);
  const totals = { fuelLitres: 0, co2Tonnes: 0, tonnes: 0, hours: 0 };
  for (const p of periods) for (const q of REF_QUANTITIES) totals[q] += p[q];
  return { horizonYears: N, periods, npv, failureBeforePlanned, totals };
}
