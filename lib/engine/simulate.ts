/**
 * The year-by-year run of one policy on one truck (MODEL.md sections 3–5):
 * hours in segments, events (overhaul, failure, repower), fuel, oil services,
 * tonnes and days down, all in physical quantities and pre-tax money at each
 * period's prices. Tax and cash flow are assembled in cash-flow.ts.
 */
import type { Engine } from '@/lib/validation/case';
import { medianFailureAge } from './reliability';
import type { TruckSetup } from './setup';
import { ZERO } from './time-value';
import type { EngineEvent, EventKind, FailureAgeProvider, PolicyKey, Segment } from './types';

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
  segments: Segment[];
  events: EngineEvent[];
  /** engine fitted and its age at the end of year N */
  endEngine: Engine;
  endAge: number;
}

function emptyPeriod(): PeriodRun {
  return {
    hours: 0, fuelLitres: 0, tonnes: 0, extraTonnes: 0, oilServices: 0, topUpLitres: 0, downtimeDays: 0,
    lube: 0, overhauls: 0, failures: 0, capital: 0, lostMargin: 0, extraMargin: 0,
  };
}

function clearPeriod(p: PeriodRun): void {
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
  let count = Math.floor((a2 + ZERO) / interval) - Math.floor((a1 + ZERO) / interval);
  if (endsInEvent && count > 0) {
    const m = Math.round(a2 / interval);
    if (Math.abs(a2 - m * interval) < ZERO) count -= 1;
  }
  return count;
}

/** Mutable state of one policy run (module-level helpers instead of closures keep the hot path lean). */
interface RunState {
  setup: TruckSetup;
  policy: PolicyKey;
  failureAge: FailureAgeProvider | undefined;
  trace: boolean;
  periods: PeriodRun[];
  segments: Segment[];
  events: EngineEvent[];
  /** index of the truck in its case, passed to the failure-age provider */
  truckIndex: number;
  engine: Engine;
  burn: number;
  age: number;
  lifeIndex: number;
  failAt: number;
  repowered: boolean;
  tph: number;
  extraTph: number;
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
  if (!st.failureAge) return medianFailureAgeMemo(startAge, e.weibullShape, e.weibullScaleHours);
  const truckId = st.setup.truck.id;
  const f = st.failureAge({ truckId, truckIndex: st.truckIndex, policy: st.policy, engineId: e.id, engine: e, lifeIndex: st.lifeIndex, startAge });
  if (!Number.isFinite(f) || !(f > startAge)) {
    throw new RangeError(`failure age ${f} for truck ${truckId} must be finite and above its start age ${startAge}`);
  }
  return f;
}

/** Book an event in period y: its cost, days down and lost margin; then the engine starts a new life. */
function bookEvent(st: RunState, kind: EventKind, y: number, hourOfYear: number): void {
  const { setup } = st;
  const { offer, truck } = setup;
  const p = st.periods[y];
  const idx = setup.generalIndex[y];
  const engine = st.engine;
  let baseCost: number;
  let days: number;
  if (kind === 'repower') {
    baseCost = offer.modulePrice + offer.installCost - offer.coreCredit;
    days = offer.downtimeDays;
  } else if (kind === 'overhaul') {
    baseCost = engine.overhaulCost;
    days = engine.overhaulDowntimeDays;
  } else {
    baseCost = engine.failureCost;
    days = engine.failureDowntimeDays;
  }
  const cost = baseCost * idx;
  // days down at the rate before the event: a repower's own days at the old rate
  const lost = ((days * truck.annualHours) / 365) * st.tph * setup.a.marginPerTonne * idx;
  if (kind === 'repower') p.capital += cost;
  else if (kind === 'overhaul') p.overhauls += cost;
  else p.failures += cost;
  p.lostMargin += lost;
  p.downtimeDays += days;
  const event: EngineEvent = {
    kind, period: y, hourOfYear, engineId: engine.id, engineAge: st.age,
    baseCost, priceIndex: idx, cost, downtimeDays: days, downtimeTonnesPerHour: st.tph, lostMargin: lost,
  };
  if (kind === 'repower') {
    event.newEngineId = setup.next.id;
    st.engine = setup.next;
    st.burn = setup.burnNext;
    st.repowered = true;
    st.extraTph = truck.tonnesPerHour * offer.productivityGain;
    st.tph = truck.tonnesPerHour + st.extraTph;
  }
  st.events.push(event);
  st.age = 0;
  st.lifeIndex += 1;
  st.failAt = drawFailureAge(st, 0);
}

/** The next event's age and kind: keep waits for the failure; rebuild takes the planned life unless
 * the failure comes first (equal counts as planned); repower replaces the first of them. */
function nextEventAge(st: RunState): number {
  if (st.policy === 'keep') return st.failAt;
  const planned = st.engine.lifeHours;
  return st.failAt < planned - ZERO ? st.failAt : planned;
}
function nextEventKind(st: RunState): EventKind {
  if (st.policy === 'keep') return 'failure';
  if (st.policy === 'repower' && !st.repowered) return 'repower';
  return st.failAt < st.engine.lifeHours - ZERO ? 'failure' : 'overhaul';
}

/** A run with no periods yet, to be filled (and refilled) by `simulatePolicyInto`. */
export function emptyPolicyRun(): PolicyRun {
  return { policy: 'keep', periods: [], segments: [], events: [], endEngine: undefined as unknown as Engine, endAge: 0 };
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
  return simulatePolicyInto(emptyPolicyRun(), setup, policy, failureAge, trace, truckIndex);
}

/**
 * `simulatePolicy` writing into `run`, whose period objects are zeroed and
 * reused (Monte Carlo refills one run per policy instead of allocating some
 * fifty objects per truck and iteration). Periods past N may be left over from
 * a longer truck: readers stop at N. Events and segments are new each time.
 */
export function simulatePolicyInto(
  run: PolicyRun,
  setup: TruckSetup,
  policy: PolicyKey,
  failureAge?: FailureAgeProvider,
  trace = false,
  truckIndex = -1,
): PolicyRun {
  const { truck, a: as, offer, n, hours, generalIndex } = setup;
  const periods = run.periods;
  for (let y = 0; y <= n; y++) {
    if (y < periods.length) clearPeriod(periods[y]);
    else periods.push(emptyPeriod());
  }
  const st: RunState = {
    setup, policy, failureAge, trace, periods, segments: [], events: [], truckIndex,
    engine: setup.start, burn: setup.burnStart, age: truck.engineHours, lifeIndex: 0, failAt: 0,
    repowered: false, tph: truck.tonnesPerHour, extraTph: 0,
  };
  st.failAt = drawFailureAge(st, st.age);

  // period 0: an engine at or past its planned life has its planned event now; a "now" repower too
  if (policy !== 'keep' && st.age >= st.engine.lifeHours - ZERO) bookEvent(st, policy === 'rebuild' ? 'overhaul' : 'repower', 0, 0);
  if (policy === 'repower' && !st.repowered && offer.timing === 'now') bookEvent(st, 'repower', 0, 0);

  for (let y = 1; y <= n; y++) {
    const p = periods[y];
    const idx = generalIndex[y];
    const lubePrice = as.lubePrice * idx;
    const margin = as.marginPerTonne * idx;
    let left = hours[y];
    let ran = 0;
    while (left > 0) {
      const dist = nextEventAge(st) - st.age;
      let happens: boolean;
      if (dist < left - ZERO) happens = true;
      else if (dist <= left + ZERO) happens = y < n; // at the year's last hour: not at the very end of the horizon
      else happens = false;
      const h = happens && dist < left - ZERO ? dist : left;
      const engine = st.engine;
      const a1 = st.age;
      const a2 = a1 + h;
      const services = countOilServices(a1, a2, engine.serviceIntervalHours, happens);
      const serviceCost =
        engine.sumpLitres * lubePrice + engine.serviceKitCost * idx + engine.serviceLabourHours * as.labourRate * idx;
      const topUp = engine.topUpLitresPerHour * h;
      const litres = st.burn * h;
      p.hours += h;
      p.fuelLitres += litres;
      p.tonnes += h * st.tph;
      p.extraTonnes += h * st.extraTph;
      p.oilServices += services;
      p.topUpLitres += topUp;
      p.lube += services * serviceCost + topUp * lubePrice;
      p.extraMargin += h * st.extraTph * margin;
      const kind = happens ? nextEventKind(st) : null;
      if (trace) {
        st.segments.push({
          period: y, engineId: engine.id, startAge: a1, endAge: a2, hours: h, litresPerHour: st.burn, litres,
          tonnesPerHour: st.tph, extraTonnesPerHour: st.extraTph, oilServices: services, serviceCost,
          topUpLitres: topUp, endsWith: kind,
        });
      }
      st.age = a2;
      left -= h;
      ran += h;
      if (kind) bookEvent(st, kind, y, ran);
    }
  }
  run.policy = policy;
  run.segments = st.segments;
  run.events = st.events;
  run.endEngine = st.engine;
  run.endAge = st.age;
  return run;
}
