/**
 * The year-by-year run of one policy on one truck (MODEL.md sections 3–5):
 * hours in segments, events (overhaul, failure, repower), fuel, oil services,
 * tonnes and days down, all in physical quantities and pre-tax money at each
 * period's prices, kept per period for the cash-flow table (cash-flow.ts
 * assembles tax and cash flow from them). As it goes, the run also sums the
 * present value of each kind of money, from which the npv follows without a
 * second pass (`npvFromTotals`): all Monte Carlo and sensitivity re-runs read.
 */
import type { Engine } from '@/lib/validation/case';
import { npvFromTotals, residualCredit, type DiscountedTotals } from './cash-flow';
import { addSpendInto, isDepreciatedSpend } from './depreciation';
import { EventLimitError, MAX_EVENTS_PER_RUN } from './limits';
import { medianFailureAge } from './reliability';
import type { TruckSetup } from './setup';
import { ZERO } from './time-value';
import { EVENT_CODE, EVENT_KINDS, type EngineEvent, type EventCounts, type PeriodQuantities, type FailureAgeProvider, type PolicyKey, type Segment } from './types';

/** Pre-tax physical and money totals of one period, before tax. */
export interface PeriodRun {
  hours: number;
  fuelLitres: number;
  tonnes: number;
  extraTonnes: number;
  oilServices: number;
  topUpLitres: number;
  downtimeDays: number;
  /** positive amounts of money at the period's prices */
  lube: number;
  overhauls: number;
  failures: number;
  capital: number;
  lostMargin: number;
  extraMargin: number;
}

export interface PolicyRun {
  policy: PolicyKey;
  periods: PeriodRun[];
  /** the events of the run, in order, as numbers (always kept): what depreciation reads */
  log: EventLog;
  /** with `trace` only: the segments and the events as records (the detailed output) */
  segments: Segment[];
  events: EngineEvent[];
  /** engine fitted and its age at the end of year N */
  endEngine: Engine;
  endAge: number;
  /** present values of what the run spends and earns, by kind, summed as it went */
  discounted: DiscountedTotals;
  /**
   * tax depreciation of the run's depreciated spends by period, read for
   * y = 0..N when `depreciated` (else there is none); write-off in `discounted.writeOff`
   */
  depreciation: number[];
  depreciated: boolean;
  /** Σ CF_y·DF_y from the discounted totals (`npvFromTotals`) */
  npv: number;
  /** the run's working state, reused by the next run into this object */
  state: RunState;
  /** MODEL.md section 11: on a path 0 or 1 (the first life ended in service within the horizon) */
  failureBeforePlanned: number;
  /** expected event counts by period when the run is an expectation (expected.ts); null: count the log */
  eventCounts: EventCounts[] | null;
  /** the expected residual credit (expected.ts); null: the credit of endEngine at endAge */
  residualCredit: number | null;
  /** expected quantities by period (expected.ts); null: read them from the trace */
  quantities: PeriodQuantities[] | null;
}

const OVERHAUL = EVENT_CODE.overhaul;
const FAILURE = EVENT_CODE.failure;
const REPOWER = EVENT_CODE.repower;
/** No event ends the segment. */
const NONE = -1;

/**
 * Events of a run as numbers (period, kind code, cost), in order; `count` of
 * them are the run's (a reused log keeps longer arrays from earlier runs).
 */
export interface EventLog {
  count: number;
  period: number[];
  kind: number[];
  /** baseCost · priceIndex, as EngineEvent.cost */
  cost: number[];
}

function emptyEventLog(): EventLog {
  return { count: 0, period: [], kind: [], cost: [] };
}

export function logEvent(log: EventLog, period: number, kind: number, cost: number): void {
  const i = log.count;
  log.period[i] = period;
  log.kind[i] = kind;
  log.cost[i] = cost;
  log.count = i + 1;
}

/**
 * Where failure ages come from when they are not the median path: asked once
 * per engine life, with the life's start age, and must return an age above it.
 * Monte Carlo passes one object for a whole run (no record per call); a
 * `FailureAgeProvider` function is wrapped in one (`failureSourceOf`).
 */
export interface FailureAgeSource {
  ageAt(truckIndex: number, lifeIndex: number, engine: Engine, startAge: number, policy: PolicyKey, truckId: string): number;
}

/** A provider function as a source: it is told the whole context record. */
export function failureSourceOf(provider: FailureAgeProvider): FailureAgeSource {
  return {
    ageAt: (truckIndex, lifeIndex, engine, startAge, policy, truckId) =>
      provider({ truckId, truckIndex, policy, engineId: engine.id, engine, lifeIndex, startAge }),
  };
}

export function emptyPeriod(): PeriodRun {
  return {
    hours: 0, fuelLitres: 0, tonnes: 0, extraTonnes: 0, oilServices: 0, topUpLitres: 0, downtimeDays: 0,
    lube: 0, overhauls: 0, failures: 0, capital: 0, lostMargin: 0, extraMargin: 0,
  };
}

export function clearPeriod(p: PeriodRun): void {
  p.hours = 0; p.fuelLitres = 0; p.tonnes = 0; p.extraTonnes = 0; p.oilServices = 0; p.topUpLitres = 0;
  p.downtimeDays = 0; p.lube = 0; p.overhauls = 0; p.failures = 0; p.capital = 0; p.lostMargin = 0; p.extraMargin = 0;
}

/**
 * Oil services in a segment from age a1 to a2 with interval I: one at every
 * multiple of I in (a1, a2], less one when a2 is itself a multiple and the
 * segment ends in an event (the event includes the oil change). Ages within
 * 1e-6 h of a multiple count as on it.
 *
 * @example countOilServices(16500, 22500, 250, false) // = 24
 */
export function countOilServices(a1: number, a2: number, interval: number, endsInEvent: boolean): number {
  return servicesBetween(serviceMarkAt(a1, interval), serviceMarkAt(a2, interval), a2, interval, endsInEvent);
}

/**
 * `countOilServices` from the service marks of the segment's two ends (the
 * simulation carries the end mark of one segment over as the start of the next).
 */
function servicesBetween(markBefore: number, markAfter: number, a2: number, interval: number, endsInEvent: boolean): number {
  let count = markAfter - markBefore;
  if (endsInEvent && count > 0 && Math.abs(a2 - Math.round(a2 / interval) * interval) < ZERO) count -= 1;
  return count;
}

/**
 * Mutable state of one policy run (module-level helpers instead of closures
 * keep the hot path lean). One object per `PolicyRun`, reset at each run.
 */
export interface RunState {
  setup: TruckSetup;
  policy: PolicyKey;
  failures: FailureAgeSource | null;
  trace: boolean;
  /** keep the period records (the full path) */
  records: boolean;
  periods: PeriodRun[];
  log: EventLog;
  segments: Segment[];
  events: EngineEvent[];
  /** index of the truck in its case, passed to the failure-age source */
  truckIndex: number;
  engine: Engine;
  burn: number;
  age: number;
  /** floor((age + 1e-6) / service interval): oil services counted up to the current age */
  serviceMark: number;
  lifeIndex: number;
  failAt: number;
  /** operating hours run in the period before the event being booked */
  hourOfYear: number;
  repowered: boolean;
  /** the life of the engine fitted at the start ended in service: a failure, or a failed swap */
  firstFailed: boolean;
  tph: number;
  extraTph: number;
  /** present values so far */
  d: DiscountedTotals;
  /** depreciation by period so far (0..N), kept once a spend is depreciated (most runs have none) */
  depreciation: number[];
  depreciated: boolean;
}

/**
 * A few recent median failure ages by (start age, β, η): on the median path
 * every new engine of a type has the same one, and the three policies of a
 * truck share the first, so most lives reuse a number instead of taking two
 * powers. Same arguments, same function: the same number.
 */
const MEMO = 8;
const memoAge = new Float64Array(MEMO).fill(Number.NaN);
const memoShape = new Float64Array(MEMO);
const memoScale = new Float64Array(MEMO);
const memoValue = new Float64Array(MEMO);
let memoNext = 0;

function medianFailureAgeMemo(age: number, shape: number, scale: number): number {
  for (let k = 0; k < MEMO; k++) {
    if (memoAge[k] === age && memoShape[k] === shape && memoScale[k] === scale) return memoValue[k];
  }
  const value = medianFailureAge(age, shape, scale);
  const k = memoNext;
  memoNext = (memoNext + 1) % MEMO;
  memoAge[k] = age;
  memoShape[k] = shape;
  memoScale[k] = scale;
  memoValue[k] = value;
  return value;
}

function drawFailureAge(st: RunState, startAge: number): number {
  const e = st.engine;
  if (st.failures === null) return medianFailureAgeMemo(startAge, e.weibullShape, e.weibullScaleHours);
  const truckId = st.setup.truck.id;
  const f = st.failures.ageAt(st.truckIndex, st.lifeIndex, e, startAge, st.policy, truckId);
  if (!Number.isFinite(f) || !(f > startAge)) {
    throw new RangeError(`failure age ${f} for truck ${truckId} must be finite and above its start age ${startAge}`);
  }
  return f;
}

/** floor((age + 1e-6) / interval), the oil-service count up to an age (see `countOilServices`). */
function serviceMarkAt(age: number, interval: number): number {
  return Math.floor((age + ZERO) / interval);
}

/**
 * Book an event in period y: its cost, days down and lost margin; then the
 * engine starts a new life. `unplanned`: a repower brought forward by a
 * failure of the old engine (MODEL.md section 3): the failed core earns
 * `failedCoreCredit`, and the truck is down the larger of the offer's days and
 * the old engine's failure days (no repair is booked).
 */
function bookEvent(st: RunState, code: number, y: number, unplanned: boolean): void {
  const { setup } = st;
  const { offer, truck } = setup;
  const idx = setup.generalIndex[y];
  const engine = st.engine;
  let baseCost: number;
  let days: number;
  if (code === REPOWER) {
    baseCost = offer.modulePrice + offer.installCost - (unplanned ? offer.failedCoreCredit : offer.coreCredit);
    days = unplanned ? Math.max(offer.downtimeDays, engine.failureDowntimeDays) : offer.downtimeDays;
  } else if (code === OVERHAUL) {
    baseCost = engine.overhaulCost;
    days = engine.overhaulDowntimeDays;
  } else {
    baseCost = engine.failureCost;
    days = engine.failureDowntimeDays;
  }
  const cost = baseCost * idx;
  // days down at the rate before the event: a repower's own days at the old rate
  // (MODEL.md section 5: only lostMarginShare of a day down's margin is really lost)
  const lost = ((days * truck.annualHours) / 365) * st.tph * setup.a.marginPerTonne * idx * setup.a.lostMarginShare;
  const df = setup.discountFactor[y];
  const d = st.d;
  if (code === REPOWER) d.capital += cost * df;
  else if (code === OVERHAUL) d.overhauls += cost * df;
  else d.failures += cost * df;
  d.lostMargin += lost * df;
  if (st.records) {
    const p = st.periods[y];
    if (code === REPOWER) p.capital += cost;
    else if (code === OVERHAUL) p.overhauls += cost;
    else p.failures += cost;
    p.lostMargin += lost;
    p.downtimeDays += days;
  }
  // the guard against a run that would not end (a life of a few hours): see limits.ts
  if (st.log.count >= MAX_EVENTS_PER_RUN) throw new EventLimitError(truck.id, st.policy);
  if (isDepreciatedSpend(code === REPOWER, cost, setup.a.rebuildAccounting === 'expense')) depreciateSpend(st, cost, y);
  logEvent(st.log, y, code, cost);
  if (st.trace) {
    const kind = EVENT_KINDS[code];
    const event: EngineEvent = {
      kind, period: y, hourOfYear: st.hourOfYear, engineId: engine.id, engineAge: st.age,
      baseCost, priceIndex: idx, cost, downtimeDays: days, downtimeTonnesPerHour: st.tph, lostMargin: lost,
    };
    if (code === REPOWER) event.newEngineId = setup.next.id;
    if (unplanned) event.unplanned = true;
    st.events.push(event);
  }
  if (code === REPOWER) {
    st.engine = setup.next;
    st.burn = setup.burnNext;
    st.repowered = true;
    st.extraTph = truck.tonnesPerHour * offer.productivityGain;
    st.tph = truck.tonnesPerHour + st.extraTph;
  }
  if (st.lifeIndex === 0) st.firstFailed = code === FAILURE || unplanned;
  st.age = 0;
  st.serviceMark = serviceMarkAt(0, st.engine.serviceIntervalHours);
  st.lifeIndex += 1;
  st.failAt = drawFailureAge(st, 0);
}

/** The next event's age and kind: keep waits for the failure; rebuild takes the planned life unless
 * the failure comes first (equal counts as planned); repower replaces the first of them. */
function nextEventAge(st: RunState, keep: boolean): number {
  if (keep) return st.failAt;
  const planned = st.engine.lifeHours;
  return st.failAt < planned - ZERO ? st.failAt : planned;
}
function nextEventKind(st: RunState, keep: boolean, repower: boolean): number {
  if (keep) return FAILURE;
  if (repower && !st.repowered) return REPOWER;
  return st.failAt < st.engine.lifeHours - ZERO ? FAILURE : OVERHAUL;
}

/** Record a segment (the detailed output only). */
function pushSegment(
  st: RunState, y: number, engine: Engine, startAge: number, endAge: number, h: number, burn: number, litres: number,
  tph: number, extraTph: number, services: number, serviceCost: number, topUp: number, code: number,
): void {
  st.segments.push({
    period: y, engineId: engine.id, startAge, endAge, hours: h, litresPerHour: burn, litres,
    tonnesPerHour: tph, extraTonnesPerHour: extraTph, oilServices: services, serviceCost,
    topUpLitres: topUp, endsWith: code === NONE ? null : EVENT_KINDS[code],
  });
}

function emptyTotals(): DiscountedTotals {
  return { energy: 0, lube: 0, lostMargin: 0, overhauls: 0, failures: 0, capital: 0, extraMargin: 0, depreciation: 0, writeOff: 0 };
}

export function clearTotals(d: DiscountedTotals): void {
  d.energy = 0; d.lube = 0; d.lostMargin = 0; d.overhauls = 0; d.failures = 0; d.capital = 0; d.extraMargin = 0;
  d.depreciation = 0; d.writeOff = 0;
}

/**
 * A depreciated spend booked in period s: its schedule added to the run's
 * depreciation by year (D_j in year max(s, 1) + j − 1, MODEL.md section 6,
 * placed by `addSpendInto`) and what falls after year N to the write-off.
 */
function depreciateSpend(st: RunState, cost: number, period: number): void {
  const { setup } = st;
  if (!st.depreciated) {
    for (let y = 0; y <= setup.n; y++) st.depreciation[y] = 0;
    st.depreciated = true;
  }
  st.d.writeOff += addSpendInto(cost, setup.a.depreciation, period, setup.n, st.depreciation);
}

// what a run without trace shows as its segments and event records (never pushed to: pushes need `trace`)
const NO_SEGMENTS: readonly Segment[] = Object.freeze([]);
const NO_EVENTS: readonly EngineEvent[] = Object.freeze([]);

/** A run with no periods yet, to be filled (and refilled) by `simulatePolicyInto`. */
export function emptyPolicyRun(): PolicyRun {
  const periods: PeriodRun[] = [];
  const log = emptyEventLog();
  const state: RunState = {
    setup: undefined as unknown as TruckSetup, policy: 'keep', failures: null, trace: false, records: true, periods, log,
    segments: [], events: [], truckIndex: -1, engine: undefined as unknown as Engine, burn: 0, age: 0, serviceMark: 0,
    lifeIndex: 0, failAt: 0, hourOfYear: 0, repowered: false, firstFailed: false, tph: 0, extraTph: 0, d: emptyTotals(), depreciation: [], depreciated: false,
  };
  return {
    policy: 'keep', periods, log, segments: [], events: [], endEngine: undefined as unknown as Engine, endAge: 0,
    discounted: state.d, depreciation: state.depreciation, depreciated: false, npv: Number.NaN, state,
    failureBeforePlanned: 0, eventCounts: null, residualCredit: null, quantities: null,
  };
}

/**
 * Run one policy over the horizon. Deterministic on the median path unless a
 * failure-age provider is given; pure (the setup is only read). With `trace`
 * the segments are recorded too (for the detailed output).
 */
export function simulatePolicy(
  setup: TruckSetup,
  policy: PolicyKey,
  failureAge?: FailureAgeProvider,
  trace = false,
  truckIndex = -1,
): PolicyRun {
  return simulatePolicyInto(emptyPolicyRun(), setup, policy, failureAge ? failureSourceOf(failureAge) : null, trace, truckIndex);
}

/**
 * `simulatePolicy` writing into `run`, whose period objects, event log and
 * state are zeroed and reused (Monte Carlo refills one run per policy and
 * allocates nothing per truck and iteration). Periods past N may be left over
 * from a longer truck: readers stop at N. With `trace`, the segments and
 * event records are new arrays each time. Without `records` (the lean path,
 * which reads only the npv) the period records are not kept at all.
 */
export function simulatePolicyInto(
  run: PolicyRun,
  setup: TruckSetup,
  policy: PolicyKey,
  failures: FailureAgeSource | null = null,
  trace = false,
  truckIndex = -1,
  records = true,
): PolicyRun {
  const { truck, a: as, offer, n, hours, generalIndex } = setup;
  const periods = run.periods;
  if (records) {
    for (let y = 0; y <= n; y++) {
      if (y < periods.length) clearPeriod(periods[y]);
      else periods.push(emptyPeriod());
    }
  }
  const st = run.state;
  st.records = records;
  st.setup = setup;
  st.policy = policy;
  st.failures = failures;
  st.trace = trace;
  st.log.count = 0;
  st.segments = trace ? [] : (NO_SEGMENTS as Segment[]);
  st.events = trace ? [] : (NO_EVENTS as EngineEvent[]);
  st.truckIndex = truckIndex;
  clearTotals(st.d);
  st.depreciated = false;
  st.engine = setup.start;
  st.burn = setup.burnStart;
  st.age = truck.engineHours;
  st.serviceMark = serviceMarkAt(st.age, st.engine.serviceIntervalHours);
  st.lifeIndex = 0;
  st.hourOfYear = 0;
  st.repowered = false;
  st.firstFailed = false;
  st.tph = truck.tonnesPerHour;
  st.extraTph = 0;
  st.failAt = drawFailureAge(st, st.age);

  // period 0: an engine at or past its planned life has its planned event now; a "now" repower too
  const keep = policy === 'keep';
  const repower = policy === 'repower';
  if (!keep && st.age >= st.engine.lifeHours - ZERO) bookEvent(st, repower ? REPOWER : OVERHAUL, 0, false);
  if (repower && !st.repowered && offer.timing === 'now') bookEvent(st, REPOWER, 0, false);

  // the run's state in locals while segments follow one another (reloaded after each event, which changes it),
  // and the year's segment totals in locals too, added in segment order and stored once at the year's end
  // (events add only to other fields of the period: capital, overhauls, failures, days down, lost margin)
  const labourRate = as.labourRate;
  let age = st.age;
  let serviceMark = st.serviceMark;
  let eventAge = nextEventAge(st, keep);
  let engine = st.engine;
  let interval = engine.serviceIntervalHours;
  let burn = st.burn;
  let tph = st.tph;
  let extraTph = st.extraTph;
  for (let y = 1; y <= n; y++) {
    const idx = generalIndex[y];
    const lubePrice = as.lubePrice * idx;
    const margin = as.marginPerTonne * idx;
    let hoursRun = 0, fuelLitres = 0, tonnes = 0, extraTonnes = 0, oilServices = 0, topUpLitres = 0, lube = 0, extraMargin = 0;
    let left = hours[y];
    while (left > 0) {
      const dist = eventAge - age;
      let happens: boolean;
      if (dist < left - ZERO) happens = true;
      else if (dist <= left + ZERO) happens = y < n; // at the year's last hour: not at the very end of the horizon
      else happens = false;
      const h = happens && dist < left - ZERO ? dist : left;
      const a2 = age + h;
      // the services of `countOilServices`, the start mark carried over from the previous segment of this life
      const mark = serviceMarkAt(a2, interval);
      const services = servicesBetween(serviceMark, mark, a2, interval, happens);
      const serviceCost = engine.sumpLitres * lubePrice + engine.serviceKitCost * idx + engine.serviceLabourHours * labourRate * idx;
      const topUp = engine.topUpLitresPerHour * h;
      const litres = burn * h;
      hoursRun += h;
      fuelLitres += litres;
      tonnes += h * tph;
      extraTonnes += h * extraTph;
      oilServices += services;
      topUpLitres += topUp;
      lube += services * serviceCost + topUp * lubePrice;
      extraMargin += h * extraTph * margin;
      left -= h;
      if (!happens) {
        if (trace) pushSegment(st, y, engine, age, a2, h, burn, litres, tph, extraTph, services, serviceCost, topUp, NONE);
        age = a2;
        serviceMark = mark;
        continue;
      }
      st.age = a2;
      const code = nextEventKind(st, keep, repower);
      if (trace) pushSegment(st, y, engine, age, a2, h, burn, litres, tph, extraTph, services, serviceCost, topUp, code);
      st.hourOfYear = hoursRun; // a field, not an argument: a double argument is boxed on each call
      // a repower in place of a failure that came before the planned life is a failed swap
      bookEvent(st, code, y, code === REPOWER && st.failAt < engine.lifeHours - ZERO);
      age = st.age;
      serviceMark = st.serviceMark;
      eventAge = nextEventAge(st, keep);
      engine = st.engine;
      interval = engine.serviceIntervalHours;
      burn = st.burn;
      tph = st.tph;
      extraTph = st.extraTph;
    }
    if (records) {
      const p = periods[y];
      p.hours = hoursRun;
      p.fuelLitres = fuelLitres;
      p.tonnes = tonnes;
      p.extraTonnes = extraTonnes;
      p.oilServices = oilServices;
      p.topUpLitres = topUpLitres;
      p.lube = lube;
      p.extraMargin = extraMargin;
    }
    const d = st.d;
    const df = setup.discountFactor[y];
    d.energy += fuelLitres * setup.energyCost[y];
    d.lube += lube * df;
    d.extraMargin += extraMargin * df;
  }
  st.age = age;
  st.serviceMark = serviceMark;
  run.policy = policy;
  run.log = st.log;
  run.segments = st.segments;
  run.events = st.events;
  run.endEngine = st.engine;
  run.endAge = st.age;
  run.discounted = st.d;
  if (st.depreciated) {
    let pv = 0;
    for (let y = 1; y <= n; y++) pv += st.depreciation[y] * setup.discountFactor[y];
    st.d.depreciation = pv;
  }
  run.depreciation = st.depreciation;
  run.depreciated = st.depreciated;
  run.failureBeforePlanned = st.firstFailed ? 1 : 0;
  run.eventCounts = null;
  run.residualCredit = null;
  run.quantities = null;
  const end = st.engine;
  const credit = residualCredit(end.overhaulCost, st.age, end.lifeHours, generalIndex[n]);
  run.npv = npvFromTotals(st.d, as.taxRate, as.rebuildAccounting === 'expense', setup.discountFactor[n], credit);
  return run;
}

/**
 * Events booked in each period 0..n of a run, counted from its log (repairs
 * are failures; a failed swap is a repower).
 */
export function countEvents(log: EventLog, n: number): EventCounts[] {
  const out: EventCounts[] = [];
  for (let y = 0; y <= n; y++) out.push({ overhauls: 0, repairs: 0, repowers: 0 });
  for (let i = 0; i < log.count; i++) {
    const c = out[log.period[i]];
    const k = log.kind[i];
    if (k === OVERHAUL) c.overhauls += 1;
    else if (k === FAILURE) c.repairs += 1;
    else c.repowers += 1;
  }
  return out;
}
