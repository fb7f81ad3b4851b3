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

/**
 * Run one policy over the horizon. Deterministic on the median path unless a
 * failure-age provider is given; pure (the setup is only read).
 */
export function simulatePolicy(setup: TruckSetup, policy: PolicyKey, failureAge?: FailureAgeProvider): PolicyRun {
  const { truck, a: as, start, offer, next, n, hours, generalIndex } = setup;
  const periods: PeriodRun[] = [];
  for (let y = 0; y <= n; y++) periods.push(emptyPeriod());
  const segments: Segment[] = [];
  const events: EngineEvent[] = [];
  const dayHours = truck.annualHours / 365;
  const baseTph = truck.tonnesPerHour;

  let engine = start;
  let burn = setup.burnStart;
  let age = truck.engineHours;
  let lifeIndex = 0;
  let repowered = false;
  let tph = baseTph;
  let extraTph = 0;

  const drawFailureAge = (startAge: number): number => {
    if (!failureAge) return medianFailureAge(startAge, engine.weibullShape, engine.weibullScaleHours);
    const f = failureAge({ truckId: truck.id, policy, engineId: engine.id, lifeIndex, startAge });
    if (!Number.isFinite(f) || !(f > startAge)) {
      throw new RangeError(`failure age ${f} for truck ${truck.id} must be finite and above its start age ${startAge}`);
    }
    return f;
  };
  let failAt = drawFailureAge(age);

  const book = (kind: EventKind, y: number, hourOfYear: number): void => {
    const p = periods[y];
    const idx = generalIndex[y];
    const margin = as.marginPerTonne * idx;
    let baseCost: number;
    let days: number;
    if (kind === 'repower') {
      baseCost = offer.modulePrice + offer.installCost - offer.coreCredit;
      days = offer.downtimeDays;
    } else {
      baseCost = kind === 'overhaul' ? engine.overhaulCost : engine.failureCost;
      days = kind === 'overhaul' ? engine.overhaulDowntimeDays : engine.failureDowntimeDays;
    }
    const cost = baseCost * idx;
    const lost = days * dayHours * tph * margin; // a repower's own days at the old rate
    if (kind === 'repower') p.capital += cost;
    else if (kind === 'overhaul') p.overhauls += cost;
    else p.failures += cost;
    p.lostMargin += lost;
    p.downtimeDays += days;
    events.push({
      kind, period: y, hourOfYear, engineId: engine.id, engineAge: age,
      ...(kind === 'repower' ? { newEngineId: next.id } : {}),
      baseCost, priceIndex: idx, cost, downtimeDays: days, downtimeTonnesPerHour: tph, lostMargin: lost,
    });
    if (kind === 'repower') {
      engine = next;
      burn = setup.burnNext;
      repowered = true;
      extraTph = baseTph * offer.productivityGain;
      tph = baseTph + extraTph;
    }
    age = 0;
    lifeIndex += 1;
    failAt = drawFailureAge(0);
  };

  /** the next event's age and kind under this policy */
  const nextEvent = (): { at: number; kind: EventKind } => {
    if (policy === 'keep') return { at: failAt, kind: 'failure' };
    const planned = engine.lifeHours;
    const kind: EventKind = failAt < planned - ZERO ? 'failure' : 'overhaul';
    const at = kind === 'failure' ? failAt : planned;
    if (policy === 'repower' && !repowered) return { at, kind: 'repower' };
    return { at, kind };
  };

  // period 0: an engine at or past its planned life has its planned event now; a "now" repower too
  if (policy !== 'keep' && age >= engine.lifeHours - ZERO) book(policy === 'rebuild' ? 'overhaul' : 'repower', 0, 0);
  if (policy === 'repower' && !repowered && offer.timing === 'now') book('repower', 0, 0);

  for (let y = 1; y <= n; y++) {
    const p = periods[y];
    const idx = generalIndex[y];
    const lubePrice = as.lubePrice * idx;
    const margin = as.marginPerTonne * idx;
    let left = hours[y];
    let ran = 0;
    while (left > 0) {
      const ev = nextEvent();
      const dist = ev.at - age;
      let happens: boolean;
      if (dist < left - ZERO) happens = true;
      else if (dist <= left + ZERO) happens = y < n; // at the year's last hour: not at the very end of the horizon
      else happens = false;
      const h = happens && dist < left - ZERO ? dist : left;
      const a1 = age;
      const a2 = age + h;
      const services = countOilServices(a1, a2, engine.serviceIntervalHours, happens);
      const serviceCost =
        engine.sumpLitres * lubePrice + engine.serviceKitCost * idx + engine.serviceLabourHours * as.labourRate * idx;
      const topUp = engine.topUpLitresPerHour * h;
      const litres = burn * h;
      p.hours += h;
      p.fuelLitres += litres;
      p.tonnes += h * tph;
      p.extraTonnes += h * extraTph;
      p.oilServices += services;
      p.topUpLitres += topUp;
      p.lube += services * serviceCost + topUp * lubePrice;
      p.extraMargin += h * extraTph * margin;
      segments.push({
        period: y, engineId: engine.id, startAge: a1, endAge: a2, hours: h, litresPerHour: burn, litres,
        tonnesPerHour: tph, extraTonnesPerHour: extraTph, oilServices: services, serviceCost, topUpLitres: topUp,
        endsWith: happens ? ev.kind : null,
      });
      age = a2;
      left -= h;
      ran += h;
      if (happens) book(ev.kind, y, ran);
    }
  }
  return { policy, periods, segments, events, endEngine: engine, endAge: age };
}
