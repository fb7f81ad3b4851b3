/**
 * Result types of the engine: `case-result/1` (MODEL.md section 10) and the
 * detailed per-period trace behind it.
 */
import type { Engine } from '@/lib/validation/case';

export const POLICIES = ['keep', 'rebuild', 'repower'] as const;
export type PolicyKey = (typeof POLICIES)[number];

/** One period's cash by category, signed as cash (costs negative); the categories add up to CF_y. */
export interface BreakdownEntry {
  fuel: number;
  carbon: number;
  /** oil services and top-up */
  lube: number;
  overhauls: number;
  failures: number;
  /** the repower's spend alone */
  capital: number;
  lostMargin: number;
  extraMargin: number;
  /** relief on costs, tax on gains and the residual, depreciation shields, write-off */
  taxEffect: number;
  /** residual credit before tax (year N only) */
  residual: number;
}

export const BREAKDOWN_CATEGORIES = [
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
] as const satisfies readonly (keyof BreakdownEntry)[];

/** Events booked in one period: on the median path counts, with the expected valuation their expectations. */
export interface EventCounts {
  overhauls: number;
  repairs: number;
  repowers: number;
}

export interface PolicyResult {
  npv: number;
  eac: number;
  costPerHour: number;
  costPerTonne: number;
  fuelLitres: number;
  co2Tonnes: number;
  tonnes: number;
  hours: number;
  fuelLitresPerHour: number;
  cashFlows: number[];
  breakdown: BreakdownEntry[];
  /** expected number of overhauls, repairs and repowers by period 0..N (MODEL.md section 11) */
  events: EventCounts[];
  /**
   * probability that the engine fitted today fails in service before the
   * earlier of its planned life and the horizon's end (keep: the horizon's
   * end); 0 when its planned event is in period 0; 0 or 1 on the median path
   */
  failureBeforePlanned: number;
}

export interface Comparison {
  deltaNpv: number;
  irr: number | null;
  irrSignChanges: number;
  mirr: number | null;
  paybackYears: number | null;
  discountedPaybackYears: number | null;
  profitabilityIndex: number | null;
}

export interface TruckResult {
  id: string;
  horizonYears: number;
  options: Record<PolicyKey, PolicyResult>;
  repowerVsRebuild: Comparison;
  repowerVsKeep: Comparison;
  rebuildVsKeep: Comparison;
  best: PolicyKey;
}

export interface FleetFigure {
  keep: number;
  rebuild: number;
  repower: number;
  best: number;
}

export interface FleetResult {
  npv: FleetFigure;
  fuelLitres: FleetFigure;
  co2Tonnes: FleetFigure;
  /** capital spent on repowers, undiscounted, positive */
  capital: FleetFigure;
}

export interface CaseResult {
  format: 'case-result/1';
  name: string;
  trucks: TruckResult[];
  fleet: FleetResult;
}

// ------------------------------------------------------------------ detail

export type EventKind = 'overhaul' | 'failure' | 'repower';

/** Event kinds as numbers (the simulation loop and its event log use these: no string compares there). */
export const EVENT_CODE = { overhaul: 0, failure: 1, repower: 2 } as const satisfies Record<EventKind, number>;
/** The kind of each code. */
export const EVENT_KINDS: readonly EventKind[] = ['overhaul', 'failure', 'repower'];

export interface EngineEvent {
  kind: EventKind;
  period: number;
  /** operating hours run in that period before the event (0 in period 0) */
  hourOfYear: number;
  /** the engine the event acts on (for a repower, the engine removed) */
  engineId: string;
  /** that engine's age (hours) when the event happens */
  engineAge: number;
  /** the engine fitted by a repower */
  newEngineId?: string;
  /** a repower brought forward by a failure (failed core credit, the longer of the two downtimes) */
  unplanned?: boolean;
  /** pre-tax cost at year-1 prices: overhaulCost, failureCost, or module + install − core credit */
  baseCost: number;
  /** general (inflation) price index of the period */
  priceIndex: number;
  /** baseCost · priceIndex */
  cost: number;
  downtimeDays: number;
  /** tonnes per hour the days down are costed at */
  downtimeTonnesPerHour: number;
  /** downtimeDays · annualHours/365 · downtimeTonnesPerHour · margin of the period */
  lostMargin: number;
}

export interface Segment {
  period: number;
  engineId: string;
  startAge: number;
  endAge: number;
  hours: number;
  litresPerHour: number;
  litres: number;
  tonnesPerHour: number;
  /** extra tonnes per hour from a repower's productivity gain (included in tonnesPerHour) */
  extraTonnesPerHour: number;
  oilServices: number;
  /** one service at the period's prices: sump·lube + kit + labour hours·labour rate */
  serviceCost: number;
  topUpLitres: number;
  /** the event that ends the segment, null when it runs to the year's end */
  endsWith: EventKind | null;
}

export interface PriceIndex {
  fuel: number;
  carbon: number;
  /** inflation: lube, kits, labour, overhauls, repairs, modules, margin, residual */
  general: number;
}

export interface PeriodDetail {
  period: number;
  hours: number;
  fuelLitres: number;
  co2Tonnes: number;
  tonnes: number;
  extraTonnes: number;
  oilServices: number;
  topUpLitres: number;
  downtimeDays: number;
  discountFactor: number;
  priceIndex: PriceIndex;
  prices: { fuel: number; carbon: number; lube: number; labour: number; marginPerTonne: number };
  /** costs deducted from taxable income this period (positive) */
  deductibleCosts: number;
  /** extra margin taxed this period (positive) */
  taxableGains: number;
  depreciation: number;
  writeOff: number;
  /** residual credit before tax (year N only) */
  residualCredit: number;
  breakdown: BreakdownEntry;
  cashFlow: number;
}

export interface DepreciatedSpend {
  period: number;
  category: 'capital' | 'overhauls' | 'failures';
  amount: number;
  /** D_1, D_2, … of the method that fall within the horizon (years up to N; the rest is `writeOff`) */
  schedule: number[];
  /** depreciation by period 0..N (write-off excluded) */
  byPeriod: number[];
  /** basis left at the end of year N, written off in year N */
  writeOff: number;
}

export interface ResidualDetail {
  engineId: string;
  engineAge: number;
  lifeHours: number;
  overhaulCost: number;
  priceIndex: number;
  /** overhaulCost · max(0, 1 − engineAge/lifeHours) · priceIndex */
  credit: number;
}

/**
 * What the events and services of a period come to: on the median path the
 * counts of the traced events and segments, with the expected valuation
 * their expectations (what the workbook writes as values).
 */
export interface PeriodQuantities {
  /** oil services of the engine fitted at the start, and of the repower engine */
  servicesStart: number;
  servicesNew: number;
  overhauls: number;
  repairs: number;
  /** repowers at the planned life or now, and repowers brought forward by a failure (failed swaps) */
  plannedRepowers: number;
  failedRepowers: number;
  /** Σ days down · annualHours/365 · tonnes per hour at the event (before lostMarginShare) */
  lostTonnes: number;
}

export interface PolicyDetail {
  policy: PolicyKey;
  /** the valuation the figures are: the expectation over failures, or the median path (or a sampled path) */
  valuation: 'expected' | 'path';
  quantities: PeriodQuantities[];
  periods: PeriodDetail[];
  segments: Segment[];
  events: EngineEvent[];
  spends: DepreciatedSpend[];
  residual: ResidualDetail;
}

export interface TruckDetail {
  truckId: string;
  horizonYears: number;
  startEngineId: string;
  repowerEngineId: string;
  repowerOfferId: string;
  /** loadFactor · ratedKw of the engine fitted at the start */
  powerKw: number;
  /** measured / modelled burn of the start engine (1 when not measured) */
  calibrationFactor: number;
  /** calibrated burn, L/h, of each engine the truck may run */
  burnLitresPerHour: Record<string, number>;
  policies: Record<PolicyKey, PolicyDetail>;
}

export interface DetailedCaseResult {
  result: CaseResult;
  details: TruckDetail[];
}

/** What a failure-age provider (Monte Carlo) is told when an engine's life starts. */
export interface FailureAgeContext {
  truckId: string;
  /** the truck's index in the case's truck list (−1 when the caller did not say) */
  truckIndex: number;
  policy: PolicyKey;
  engineId: string;
  /** the engine itself, as the evaluated case holds it (its Weibull law is the one to draw from) */
  engine: Engine;
  /** 0 for the engine fitted at the start, then 1, 2, … after each event of the policy */
  lifeIndex: number;
  /** age at which this life starts: the truck's engine hours for life 0, else 0 */
  startAge: number;
}

/** Returns the age (hours) at which the engine fails in this life; must exceed startAge. */
export type FailureAgeProvider = (ctx: FailureAgeContext) => number;

export interface EvaluateOptions {
  /** sampled failure ages for Monte Carlo; default: the median path (MODEL.md section 3) */
  failureAge?: FailureAgeProvider;
  /** skip validation for a case already validated (e.g. many evaluations of clones) */
  trusted?: boolean;
}
