/**
 * The expected valuation (MODEL.md section 11): every per-period amount of a
 * policy as its expectation over all engine failure ages, computed
 * deterministically (no sampling).
 *
 * ## Method
 *
 * Every amount of a period is linear in a few expected quantities: the
 * expected numbers of overhauls, repairs, planned and failed-swap repowers
 * booked in the period, of oil services of each engine, the expected hours
 * run on each engine (repower), and the expected credit share of the engine
 * fitted at the end. Tax is linear too (losses are used at once;
 * depreciation schedules are linear in the spend), so the expected cash flow
 * is the cash flow of the expected quantities.
 *
 * A policy is the first life (the engine fitted today, age a0) followed by a
 * fresh process (renewal.ts) of one engine type starting when that life
 * ends, at S:
 * - keep: S = X0 − a0 (a repair), fresh keep process of the same engine;
 * - rebuild: S = min(X0 − a0, s*), s* = ℓ0 − a0 (a repair before s*, the
 *   planned overhaul at s* with probability R0 = R(ℓ0)/R(a0));
 * - repower at overhaul: the same S, ended by the repower (a failed swap
 *   before s*, the planned one at s*), fresh rebuild process of the new
 *   engine; a repower now, or any planned event of an engine at or past its
 *   life, is the atom S = 0 (period 0).
 * With F_c(s) = P(S ≤ s, a failure) = 1 − exp(H(a0) − H(a0 + s)), H(x) = (x/η)^β,
 * a fresh-process quantity Z, cumulated to the end b of a year, has the
 * expectation E[Z(b − S)] = R0·Z(b − s*) + ∫₀^{s*} Z(b − s) dF_c(s). The
 * integral runs over cells of width ≤ h whose masses F_c(s_c) − F_c(s_{c−1})
 * are exact (F_c is a cubic Hermite interpolant of its exact values at the
 * cell edges) and Z is read at the cell's centre of mass (second order, as
 * the tables). The step parts of Z (the planned-overhaul chains, the services of
 * chain lives) are integrated exactly against F_c: Σ_m q_m·F_c(b − kℓ − mI).
 * The first life's own services (at each multiple of I above a0, alive with
 * probability exp(H(a0) − H(mI))) are listed exactly; its hours (repower)
 * are ∫ P(S > τ) dτ, the Hermite cubic integrated exactly per cell.
 *
 * The horizon rule of MODEL.md section 3 applies to the atoms only (the only
 * events that can fall exactly on the last hour): a planned event exactly at
 * the end of year N does not happen, the engine keeps its age (credit 0) and
 * an oil service due at that hour counts.
 *
 * ## Error
 *
 * Every expected count is within about 6·10⁻⁶ of the exact expectation with
 * the default grid for β from 0.5 to 20 (renewal.ts gives the bound, the
 * centre-of-mass reading below β = 1, and the tests that hold it), and every
 * money amount within 0.3 × MODEL.md's 10⁻⁵ · (|npv of rebuild| + 1) on the
 * demo fleet (0.08 × at β = 0.5).
 *
 * ## Worked example (tests/unit/engine/expected-valuation.test.ts)
 *
 * scenarios/one-truck.json with an exponential old engine (β = 1,
 * η = 10,000 h) under keep: failures are a Poisson process whatever the
 * engine's age, so each year of 6,000 h books 6,000/10,000 = 0.6 expected
 * repairs (within 10⁻⁵), 0.6 × 1,350,000 of repair cost and 0.6 × 28 days
 * down at year-1 prices in year 1.
 */
import type { Engine } from '@/lib/validation/case';
import { npvFromTotals } from './cash-flow';
import { addSpendInto, isDepreciatedSpend } from './depreciation';
import {
  creditShare, gridStep, gridVersion, readTable, renewalTable, servicesByAge, type RenewalRule, type RenewalTable,
} from './renewal';
import { clearPeriod, clearTotals, emptyPeriod, emptyPolicyRun, logEvent, type PeriodRun, type PolicyRun, type RunState } from './simulate';
import type { TruckSetup } from './setup';
import { ZERO } from './time-value';
import { EVENT_CODE, type EventCounts, type PeriodQuantities, type PolicyKey } from './types';

/** The first life of the engine fitted today, as the expectation reads it. */
interface FirstLife {
  engine: Engine;
  a0: number;
  /** hours from today to the planned end (Infinity: keep); 0 when the planned event is in period 0 */
  sStar: number;
  /** probability that the life reaches its planned end: R(ℓ0)/R(a0), 0 under keep, 1 at period 0 */
  r0: number;
  /** H(a0) */
  h0: number;
  /** the planned event is in period 0 */
  atZero: boolean;
}

function hazard(e: Engine, x: number): number {
  return Math.pow(x / e.weibullScaleHours, e.weibullShape);
}

/**
 * The first life's failure law on cells over (0, L), L = min(s*, T) (keep: T):
 * F_c and its density at the cell edges (the year ends and s* are edges), so
 * that F_c between edges is a cubic Hermite interpolant (error O(w⁴)), a
 * cell's mass is exact, and the expected hours still running in a year are
 * the cubic's exact integrals.
 */
interface FirstLifeTable {
  edges: Float64Array;
  F: Float64Array;
  /** dF/ds at the edges (NaN where infinite: a new engine with β < 1 at s = 0; that cell is linear) */
  dF: Float64Array;
  mid: Float64Array;
  mass: Float64Array;
  /** cells used: up to min(s*, T) */
  count: number;
  /** cells of each year: year y holds cells firstCell[y] .. firstCell[y + 1] − 1 */
  firstCell: Int32Array;
}

/**
 * The table over (0, T) of the failure law of the engine fitted today, with
 * s* (its planned end, when inside the horizon) as an edge: keep reads all of
 * it, rebuild and repower the cells up to s* (`firstLifeView`).
 */
function buildFirstLifeTable(f: FirstLife, ends: Float64Array, width: number, sStar: number): FirstLifeTable {
  const n = ends.length - 1;
  const edges: number[] = [0];
  const firstCell = new Int32Array(n + 2);
  const split = (lo: number, hi: number) => {
    const pieces = Math.max(1, Math.ceil((hi - lo) / width));
    for (let c = 1; c <= pieces; c++) edges.push(c === pieces ? hi : lo + ((hi - lo) * c) / pieces);
  };
  for (let y = 1; y <= n; y++) {
    firstCell[y] = edges.length - 1;
    const lo = ends[y - 1];
    const hi = ends[y];
    if (sStar > lo + ZERO && sStar < hi - ZERO) {
      split(lo, sStar);
      split(sStar, hi);
    } else split(lo, hi);
  }
  const count = edges.length - 1;
  firstCell[n + 1] = count;
  const e = f.engine;
  const F = new Float64Array(count + 1);
  const dF = new Float64Array(count + 1);
  const mid = new Float64Array(count);
  const mass = new Float64Array(count);
  for (let j = 0; j <= count; j++) {
    const x = f.a0 + edges[j];
    const H = hazard(e, x);
    const surv = Math.exp(f.h0 - H);
    F[j] = -Math.expm1(f.h0 - H);
    const rate = x > 0 ? (e.weibullShape * H) / x : e.weibullShape === 1 ? 1 / e.weibullScaleHours : e.weibullShape > 1 ? 0 : Number.NaN;
    dF[j] = rate * surv;
  }
  for (let c = 0; c < count; c++) {
    // the cell's centre of mass E[s | cell] = (s1·F1 − s0·F0 − ∫F ds) / mass, ∫F from the Hermite cubic:
    // reading a table there cancels the first-order term of the midpoint rule
    const s0 = edges[c];
    const s1 = edges[c + 1];
    const w = s1 - s0;
    const m = F[c + 1] - F[c];
    mass[c] = m;
    const d0 = dF[c];
    const d1 = dF[c + 1];
    const integral = w * (F[c] + F[c + 1]) / 2 + (Number.isFinite(d0) && Number.isFinite(d1) ? (w * w * (d0 - d1)) / 12 : 0);
    const centre = m > 1e-300 ? (s1 * F[c + 1] - s0 * F[c] - integral) / m : (s0 + s1) / 2;
    mid[c] = centre > s0 && centre < s1 ? centre : (s0 + s1) / 2;
  }
  return { edges: Float64Array.from(edges), F, dF, mid, mass, count, firstCell };
}

/** The table as one policy reads it: its first `count` cells, up to min(s*, T) (none when the planned event is now). */
function firstLifeView(t: FirstLifeTable, f: FirstLife): FirstLifeTable {
  if (f.atZero) return { ...t, count: 0 };
  if (!(f.sStar < t.edges[t.count])) return t;
  let c = 0;
  while (c < t.count && t.edges[c] < f.sStar - ZERO) c++;
  return { ...t, count: c };
}

/** F_c(s) from the table: the Hermite cubic of its cell (s beyond the table: its last value). */
function failedBy(f: FirstLife, t: FirstLifeTable, s: number): number {
  if (f.atZero || !(s > 0) || t.count === 0) return 0;
  const edges = t.edges;
  if (s >= edges[t.count]) return t.F[t.count];
  let lo = 0;
  let hi = t.count;
  while (hi - lo > 1) {
    const m = (lo + hi) >> 1;
    if (edges[m] <= s) lo = m;
    else hi = m;
  }
  return hermite(t, lo, s);
}

/** The Hermite cubic of F_c on cell c at s (linear where the density is infinite). */
function hermite(t: FirstLifeTable, lo: number, s: number): number {
  const edges = t.edges;
  const w = edges[lo + 1] - edges[lo];
  const u = (s - edges[lo]) / w;
  const y0 = t.F[lo];
  const y1 = t.F[lo + 1];
  const d0 = t.dF[lo];
  const d1 = t.dF[lo + 1];
  if (!Number.isFinite(d0) || !Number.isFinite(d1)) return y0 + u * (y1 - y0);
  const u2 = u * u;
  const u3 = u2 * u;
  return (2 * u3 - 3 * u2 + 1) * y0 + (u3 - 2 * u2 + u) * w * d0 + (-2 * u3 + 3 * u2) * y1 + (u3 - u2) * w * d1;
}

/** Cells over the first life's failure times: midpoints and exact masses (the first `count` of the table). */
interface Cells {
  mid: Float64Array;
  mass: Float64Array;
  count: number;
}

/** The last table built, and what it was built for: the three policies of a truck share it. */
let lastTable: { key: string; hours: Float64Array; n: number; table: FirstLifeTable } | null = null;

function firstLifeTableOf(setup: TruckSetup, f: FirstLife, ends: Float64Array, width: number): FirstLifeTable {
  const e = setup.start;
  const a0 = setup.truck.engineHours;
  const sStar = e.lifeHours - a0;
  const key = `${e.weibullShape}|${e.weibullScaleHours}|${e.lifeHours}|${a0}|${width}`;
  if (!(lastTable && lastTable.key === key && lastTable.hours === setup.hours && lastTable.n === setup.n)) {
    const whole: FirstLife = { ...f, sStar: Number.POSITIVE_INFINITY, atZero: false };
    lastTable = { key, hours: setup.hours, n: setup.n, table: buildFirstLifeTable(whole, ends, width, sStar) };
  }
  return firstLifeView(lastTable.table, f);
}

/** E over the first life's failure of a fresh table read at x − S (the continuous part: midpoint per cell). */
function overFailures(cells: Cells, table: Float64Array, h: number, x: number): number {
  let v = 0;
  const { mid, mass } = cells;
  for (let c = 0; c < cells.count; c++) {
    const t = x - mid[c];
    if (t <= 0) break;
    v += mass[c] * readTable(table, h, t);
  }
  return v;
}

/** Σ_m q_m·F_c(x − mI): the services of a life started by a first-life failure, by x hours from today. */
function servicesAfterFailure(t: FirstLifeTable, q: Float64Array, interval: number, x: number): number {
  let v = 0;
  let cell = t.count - 1;
  const edges = t.edges;
  const top = t.count > 0 ? edges[t.count] : 0;
  for (let m = 0; m < q.length; m++) {
    const s = x - (m + 1) * interval;
    if (s <= 0) break;
    if (s >= top) {
      v += q[m] * t.F[t.count];
      continue;
    }
    while (cell > 0 && edges[cell] > s) cell--;
    v += q[m] * hermite(t, cell, s);
  }
  return v;
}

/** Whether an atom at time τ is booked by the end b of a year: τ ≤ b (+1e-6); at the horizon's end τ < b − 1e-6. */
function atomBy(tau: number, b: number, end: boolean): boolean {
  return end ? tau < b - ZERO : tau <= b + ZERO;
}

/** Cumulative expected quantities of the fresh process started at S, to the end b of a year. */
interface FreshCumulative {
  repairs: number;
  overhauls: number;
  services: number;
}

function freshCumulative(f: FirstLife, cells: FirstLifeTable, t: RenewalTable, b: number, end: boolean): FreshCumulative {
  const h = t.h;
  // the atom S = s* (or S = 0): fresh values at b − s*, once the planned end has happened
  let repairs = 0;
  let overhauls = 0;
  let services = 0;
  const hasAtom = f.r0 > 0 && (f.atZero || atomBy(f.sStar, b, end));
  if (hasAtom) {
    const x = b - f.sStar;
    repairs += f.r0 * readTable(t.U, h, x);
    let w = 1;
    for (let k = 0; ; k++) {
      const xk = x - k * t.life;
      if (xk < -ZERO || w === 0) break;
      // chain atom k (k ≥ 1 an overhaul at s* + kℓ), its services Q(xk), its repairs' overhauls U(xk)
      if (k >= 1) {
        if (atomBy(f.sStar + k * t.life, b, end)) overhauls += f.r0 * w;
        overhauls += f.r0 * w * readTable(t.U, h, xk);
      }
      services += f.r0 * w * servicesByAge(t, xk);
      if (t.rule !== 'rebuild') break;
      w *= t.chain;
    }
    services += f.r0 * readTable(t.CV, h, x);
  }
  // the continuous part: S a failure of the first life
  if (cells.count > 0) {
    repairs += overFailures(cells, t.U, h, b);
    services += overFailures(cells, t.CV, h, b);
    let w = 1;
    const q = t.serviceProbability;
    for (let k = 0; ; k++) {
      const xk = b - k * t.life;
      if (xk <= 0 || w === 0) break;
      if (k >= 1) {
        overhauls += w * failedBy(f, cells, xk);
        overhauls += w * overFailures(cells, t.U, h, xk);
      }
      // services of chain life k after a failure: q_m at S + kℓ + mI ≤ b (the points fall as m rises: one walk down the cells)
      services += w * servicesAfterFailure(cells, q, t.interval, xk);
      if (t.rule !== 'rebuild') break;
      w *= t.chain;
    }
  }
  return { repairs, overhauls, services };
}

/**
 * E[credit share of the fresh engine fitted at the end T]: the atom S = s*
 * with its chain, the continuous starts (CR), and the chain lives after a
 * first-life failure, each integrated over cells split where J jumps.
 */
function freshCreditShare(f: FirstLife, cells: FirstLifeTable, t: RenewalTable, T: number, width: number): number {
  let v = 0;
  if (f.r0 > 0 && (f.atZero || f.sStar < T - ZERO)) {
    const x = T - f.sStar;
    let w = 1;
    for (let k = 0; ; k++) {
      const xk = x - k * t.life;
      if (xk <= ZERO) break; // a chain event at the very end does not happen: its engine is at age ℓ (credit 0)
      v += f.r0 * w * creditShare(t, xk);
      if (t.rule !== 'rebuild') break;
      w *= t.chain;
    }
    v += f.r0 * readTable(t.CR, t.h, x);
  }
  if (cells.count > 0) {
    v += overFailures(cells, t.CR, t.h, T);
    const lastS = Math.min(f.sStar, T);
    let w = 1;
    for (let k = 0; ; k++) {
      // chain life k after a failure at S is fitted at T when S ∈ (T − (k+1)ℓ, T − kℓ]
      const hi = Math.min(lastS, T - k * t.life);
      const lo = Math.max(0, T - (k + 1) * t.life);
      if (hi <= 0) break;
      if (hi > lo) {
        const count = Math.max(1, Math.ceil((hi - lo) / width));
        let prev = failedBy(f, cells, lo);
        for (let c = 1; c <= count; c++) {
          const s1 = lo + ((hi - lo) * c) / count;
          const F = failedBy(f, cells, s1);
          const sm = lo + ((hi - lo) * (c - 0.5)) / count;
          v += w * (F - prev) * creditShare(t, T - k * t.life - sm);
          prev = F;
        }
      }
      if (t.rule !== 'rebuild') break;
      w *= t.chain;
    }
  }
  return v;
}

/**
 * Expected hours of year y on the engine fitted today (repower): ∫ P(S > τ) dτ
 * over the year, the Hermite cubic of 1 − F_c integrated exactly per cell
 * (w·(S0 + S1)/2 + w²·(S0′ − S1′)/12); 0 past the planned end.
 */
function runningHours(t: FirstLifeTable, y: number): number {
  let v = 0;
  const last = Math.min(t.firstCell[y + 1], t.count);
  for (let c = t.firstCell[y]; c < last; c++) {
    const w = t.edges[c + 1] - t.edges[c];
    const mean = w * (2 - t.F[c] - t.F[c + 1]) / 2;
    const d0 = t.dF[c];
    const d1 = t.dF[c + 1];
    v += Number.isFinite(d0) && Number.isFinite(d1) ? mean + (w * w * (d1 - d0)) / 12 : mean;
  }
  return v;
}

/** The first life's oil services: (time from today, probability) for each multiple of I above a0. */
function firstLifeServices(f: FirstLife, T: number, planned: boolean): { tau: number[]; p: number[] } {
  const tau: number[] = [];
  const p: number[] = [];
  if (f.atZero) return { tau, p };
  const e = f.engine;
  const I = e.serviceIntervalHours;
  const atEnd = planned && Math.abs(f.sStar - T) <= ZERO;
  for (let m = Math.floor((f.a0 + ZERO) / I) + 1; ; m++) {
    const age = m * I;
    const t = age - f.a0;
    if (t > T + ZERO) break;
    // the planned event includes the oil change, except a planned event at the very end, which does not happen
    if (planned && age >= e.lifeHours - ZERO && !(atEnd && age <= e.lifeHours + ZERO)) break;
    const alive = Math.exp(f.h0 - hazard(e, age));
    if (alive < 1e-17) break;
    tau.push(t);
    p.push(alive);
  }
  return { tau, p };
}

function firstLifeOf(setup: TruckSetup, policy: PolicyKey): FirstLife {
  const e = setup.start;
  const a0 = setup.truck.engineHours;
  const h0 = hazard(e, a0);
  if (policy === 'keep') return { engine: e, a0, sStar: Number.POSITIVE_INFINITY, r0: 0, h0, atZero: false };
  const atZero = a0 >= e.lifeHours - ZERO || (policy === 'repower' && setup.offer.timing === 'now');
  if (atZero) return { engine: e, a0, sStar: 0, r0: 1, h0, atZero: true };
  const sStar = e.lifeHours - a0;
  return { engine: e, a0, sStar, r0: Math.exp(h0 - hazard(e, e.lifeHours)), h0, atZero: false };
}

/** What a policy's expected money is linear in: cumulative counts at each year end and the per-year figures. */
interface ExpectedQuantities {
  /** cumulative at each year end t_0..t_N: planned first-life ends, first-life failures, fresh repairs, overhauls, services */
  firstEnds: Float64Array;
  firstFails: Float64Array;
  repairs: Float64Array;
  overhauls: Float64Array;
  services: Float64Array;
  /** per year: expected oil services of the first life, expected hours on the engine fitted today (repower) */
  firstLifeServices: Float64Array;
  oldHours: Float64Array;
  /** expected credit shares at the end: the first life still fitted, the fresh engine fitted */
  firstShare: number;
  freshShare: number;
  /** P(the engine fitted today is still fitted at the end) */
  firstRunning: number;
  failureBeforePlanned: number;
}

const QUANTITY_CACHE_SIZE = 4096;
const quantityCache = new Map<string, ExpectedQuantities>();

/** Forget the cached quantities and first-life tables (the bench's cold figure; the renewal tables stay). */
export function clearExpectedQuantities(): void {
  quantityCache.clear();
  lastTable = null;
}

/**
 * The expected quantities of a policy, cached by everything they depend on
 * (the engines' reliability figures, lives and service intervals, the
 * truck's hours, the offer's timing, the grid): a sensitivity run that
 * moves a price re-reads them instead of recomputing them.
 */
function expectedQuantities(setup: TruckSetup, policy: PolicyKey, f: FirstLife): ExpectedQuantities {
  const { truck, n, hours } = setup;
  const e0 = setup.start;
  const e1 = setup.next;
  const key = [
    policy, e0.weibullShape, e0.weibullScaleHours, e0.lifeHours, e0.serviceIntervalHours,
    e1.weibullShape, e1.weibullScaleHours, e1.lifeHours, e1.serviceIntervalHours,
    truck.engineHours, truck.annualHours, truck.remainingLifeHours, n, setup.offer.timing, gridVersion(),
  ].join('|');
  const found = quantityCache.get(key);
  if (found) {
    // least recently used goes first: a sensitivity run's many changed inputs must not push out the base case's
    quantityCache.delete(key);
    quantityCache.set(key, found);
    return found;
  }
  const q = computeQuantities(setup, policy, f, hours, n);
  if (quantityCache.size >= QUANTITY_CACHE_SIZE) quantityCache.delete(quantityCache.keys().next().value as string);
  quantityCache.set(key, q);
  return q;
}

function computeQuantities(setup: TruckSetup, policy: PolicyKey, f: FirstLife, hours: Float64Array, n: number): ExpectedQuantities {
  const start = setup.start;
  const repower = policy === 'repower';
  const freshEngine = repower ? setup.next : start;
  const rule: RenewalRule = policy === 'keep' ? 'keep' : 'rebuild';
  // year ends t_0..t_N in hours from today
  const ends = new Float64Array(n + 1);
  for (let y = 1; y <= n; y++) ends[y] = ends[y - 1] + hours[y];
  const T = ends[n];

  const h = gridStep(freshEngine, T);
  const table = renewalTable(freshEngine, rule, h, T);
  const width = Math.min(gridStep(start, T), gridStep(setup.next, T));
  const cells = firstLifeTableOf(setup, f, ends, width);

  // cumulative expected counts at each year end
  const firstEnds = new Float64Array(n + 1); // planned first-life ends booked (overhaul / planned repower)
  const firstFails = new Float64Array(n + 1); // first-life failures (repair / failed swap)
  const repairs = new Float64Array(n + 1);
  const overhauls = new Float64Array(n + 1);
  const services = new Float64Array(n + 1);
  for (let y = 0; y <= n; y++) {
    const b = ends[y];
    const end = y === n;
    firstEnds[y] = f.r0 > 0 && atomBy(f.sStar, b, end) ? f.r0 : 0;
    firstFails[y] = failedBy(f, cells, b);
    const c = freshCumulative(f, cells, table, b, end);
    repairs[y] = c.repairs;
    overhauls[y] = c.overhauls;
    services[y] = c.services;
  }
  // services of a chain life whose planned event would fall at the very end (it does not happen): the one at age ℓ counts
  if (rule === 'rebuild' && f.r0 > 0 && Math.abs(table.life / table.interval - Math.round(table.life / table.interval)) * table.interval <= ZERO) {
    let w = table.chain;
    for (let k = 1; w > 0; k++, w *= table.chain) {
      const tau = f.sStar + k * table.life;
      if (tau > T + ZERO) break;
      if (tau >= T - ZERO) services[n] += f.r0 * w;
    }
  }
  const firstServices = firstLifeServices(f, T, policy !== 'keep');

  const perYear = new Float64Array(n + 1);
  let fs = 0;
  for (let y = 0; y <= n; y++) {
    while (fs < firstServices.tau.length && (y === n || firstServices.tau[fs] <= ends[y] + ZERO)) {
      perYear[y] += firstServices.p[fs];
      fs++;
    }
  }
  const oldHours = new Float64Array(n + 1);
  for (let y = 1; y <= n; y++) oldHours[y] = !repower ? hours[y] : f.atZero ? 0 : runningHours(cells, y);
  const firstRunning = f.atZero || f.sStar <= T + ZERO ? 0 : 1 - failedBy(f, cells, T);
  return {
    firstEnds, firstFails, repairs, overhauls, services, firstLifeServices: perYear, oldHours,
    firstShare: firstRunning * Math.max(0, 1 - (f.a0 + T) / start.lifeHours),
    firstRunning,
    freshShare: freshCreditShare(f, cells, table, T, width),
    failureBeforePlanned: f.atZero ? 0 : failedBy(f, cells, Math.min(f.sStar, T)),
  };
}

/** One period's expected quantities and money (money at the period's prices, positive), as `bookExpectedPeriod` books them. */
export interface ExpectedPeriodAmounts {
  /** operating hours of the period, split between the engine fitted at the start and the one after a swap */
  hours: number;
  oldHours: number;
  newHours: number;
  /** tonnes an hour of the truck, and the extra an hour of the repowered truck (its productivity gain) */
  tph0: number;
  extraTph: number;
  oilServices: number;
  topUp: number;
  downtimeDays: number;
  lube: number;
  overhaulCost: number;
  repairCost: number;
  capital: number;
  lost: number;
}

/**
 * Books period y of an expected run: its record `p`, the discounted totals
 * `st.d`, and each depreciated spend (repower, then overhaul, then failure:
 * the order the detail's spends read) into `st.depreciation` and the event
 * log. Returns true when a spend of the period is depreciated. Shared by the
 * policies' expected runs here and the timing options (./timing.ts), so both
 * book a period by one rule.
 */
export function bookExpectedPeriod(setup: TruckSetup, y: number, p: PeriodRun, st: Pick<RunState, 'd' | 'log' | 'depreciation'>, m: ExpectedPeriodAmounts): boolean {
  const { a, n } = setup;
  const idx = setup.generalIndex[y];
  const df = setup.discountFactor[y];
  const d = st.d;
  p.hours = m.hours;
  p.fuelLitres = setup.burnStart * m.oldHours + setup.burnNext * m.newHours;
  p.tonnes = m.tph0 * m.hours + m.extraTph * m.newHours;
  p.extraTonnes = m.extraTph * m.newHours;
  p.oilServices = m.oilServices;
  p.topUpLitres = m.topUp;
  p.downtimeDays = m.downtimeDays;
  p.lube = m.lube;
  p.overhauls = m.overhaulCost;
  p.failures = m.repairCost;
  p.capital = m.capital;
  p.lostMargin = m.lost;
  p.extraMargin = m.extraTph * m.newHours * a.marginPerTonne * idx;
  d.energy += p.fuelLitres * setup.energyCost[y];
  d.lube += m.lube * df;
  d.lostMargin += m.lost * df;
  d.overhauls += m.overhaulCost * df;
  d.failures += m.repairCost * df;
  d.capital += m.capital * df;
  d.extraMargin += p.extraMargin * df;
  const expense = a.rebuildAccounting === 'expense';
  let depreciated = false;
  const spend = (code: number, cost: number) => {
    if (!isDepreciatedSpend(code === EVENT_CODE.repower, cost, expense)) return;
    depreciated = true;
    d.writeOff += addSpendInto(cost, a.depreciation, y, n, st.depreciation);
    logEvent(st.log, y, code, cost);
  };
  if (m.capital > 0) spend(EVENT_CODE.repower, m.capital);
  if (m.overhaulCost > 0) spend(EVENT_CODE.overhaul, m.overhaulCost);
  if (m.repairCost > 0) spend(EVENT_CODE.failure, m.repairCost);
  return depreciated;
}

/** Present value of a depreciation schedule, periods 1..N. */
export function depreciationPv(depreciation: ArrayLike<number>, discountFactor: ArrayLike<number>, n: number): number {
  let pv = 0;
  for (let y = 1; y <= n; y++) pv += depreciation[y] * discountFactor[y];
  return pv;
}

/**
 * The expected run of one policy on one truck: a `PolicyRun` whose periods
 * hold expected amounts, with `eventCounts`, `failureBeforePlanned` and the
 * expected residual credit (`residualCredit`), ready for the cash-flow
 * assembly and results that the median path uses.
 */
export function expectedPolicyRun(setup: TruckSetup, policy: PolicyKey, run: PolicyRun = emptyPolicyRun()): PolicyRun {
  const { truck, a, offer, n, hours, generalIndex, discountFactor } = setup;
  const start = setup.start;
  const repower = policy === 'repower';
  const freshEngine = repower ? setup.next : start;
  const rule: RenewalRule = policy === 'keep' ? 'keep' : 'rebuild';
  const f = firstLifeOf(setup, policy);

  const q = expectedQuantities(setup, policy, f);
  const { firstEnds, firstFails, repairs, overhauls, services } = q;

  // period by period
  const periods = run.periods;
  for (let y = 0; y <= n; y++) {
    if (y < periods.length) clearPeriod(periods[y]);
    else periods.push(emptyPeriod());
  }
  const st = run.state;
  st.setup = setup;
  st.policy = policy;
  st.log.count = 0;
  const log = st.log;
  const d = st.d;
  clearTotals(d);
  const depreciation = st.depreciation;
  for (let y = 0; y <= n; y++) depreciation[y] = 0;
  let depreciated = false;
  const expense = a.rebuildAccounting === 'expense';
  const counts: EventCounts[] = [];
  const quantities: PeriodQuantities[] = [];
  const tph0 = truck.tonnesPerHour;
  const extraTph = repower ? tph0 * offer.productivityGain : 0;
  const tphNew = tph0 + extraTph;
  const plannedSwap = offer.modulePrice + offer.installCost - offer.coreCredit;
  const failedSwap = offer.modulePrice + offer.installCost - offer.failedCoreCredit;
  const failedSwapDays = Math.max(offer.downtimeDays, start.failureDowntimeDays);
  for (let y = 0; y <= n; y++) {
    const idx = generalIndex[y];
    const p = periods[y];
    const dPlanned = firstEnds[y] - (y > 0 ? firstEnds[y - 1] : 0);
    const dFailed = firstFails[y] - (y > 0 ? firstFails[y - 1] : 0);
    const dRepairs = repairs[y] - (y > 0 ? repairs[y - 1] : 0);
    const dOverhauls = overhauls[y] - (y > 0 ? overhauls[y - 1] : 0);
    const dServices = services[y] - (y > 0 ? services[y - 1] : 0);
    const firstLifeService = q.firstLifeServices[y];
    let ov: number, rep: number, pow: number, capital: number, days: number, lostTonnes: number;
    if (repower) {
      ov = dOverhauls;
      rep = dRepairs;
      pow = dPlanned + dFailed;
      capital = (dPlanned * plannedSwap + dFailed * failedSwap) * idx;
      const daysOld = dPlanned * offer.downtimeDays + dFailed * failedSwapDays;
      const daysNew = ov * freshEngine.overhaulDowntimeDays + rep * freshEngine.failureDowntimeDays;
      days = daysOld + daysNew;
      lostTonnes = (daysOld * tph0 + daysNew * tphNew) * (truck.annualHours / 365);
    } else {
      ov = dOverhauls + dPlanned;
      rep = dRepairs + dFailed;
      pow = 0;
      capital = 0;
      days = ov * start.overhaulDowntimeDays + rep * start.failureDowntimeDays;
      lostTonnes = days * tph0 * (truck.annualHours / 365);
    }
    const lost = lostTonnes * a.marginPerTonne * a.lostMarginShare * idx;
    counts.push({ overhauls: ov, repairs: rep, repowers: pow });
    const overhaulCost = ov * freshEngine.overhaulCost * idx;
    const repairCost = rep * freshEngine.failureCost * idx;
    // hours on each engine
    const hy = hours[y];
    const oldHours = q.oldHours[y];
    const newHours = hy - oldHours;
    const lubePrice = a.lubePrice * idx;
    const serviceCost = (e: Engine) => e.sumpLitres * lubePrice + e.serviceKitCost * idx + e.serviceLabourHours * a.labourRate * idx;
    const topUp = start.topUpLitresPerHour * oldHours + (repower ? setup.next.topUpLitresPerHour * newHours : 0);
    const lube = firstLifeService * serviceCost(start) + dServices * serviceCost(freshEngine) + topUp * lubePrice;
    const servicesStart = firstLifeService + (repower ? 0 : dServices);
    quantities.push({
      servicesStart, servicesNew: repower ? dServices : 0, overhauls: ov, repairs: rep,
      plannedRepowers: repower ? dPlanned : 0, failedRepowers: repower ? dFailed : 0, lostTonnes,
    });
    if (
      bookExpectedPeriod(setup, y, p, st, {
        hours: hy, oldHours, newHours, tph0, extraTph, oilServices: firstLifeService + dServices, topUp,
        downtimeDays: days, lube, overhaulCost, repairCost, capital, lost,
      })
    )
      depreciated = true;
  }
  if (depreciated) d.depreciation = depreciationPv(depreciation, discountFactor, n);

  // residual credit: the first life still fitted at the end, or the fresh engine fitted then
  const gN = generalIndex[n];
  const credit = (start.overhaulCost * q.firstShare + freshEngine.overhaulCost * q.freshShare) * gN;

  run.policy = policy;
  run.log = log;
  run.segments = [];
  run.events = [];
  // the engine most likely fitted at the end, and the age that gives the expected credit on it
  const freshLikely = repower && 1 - q.firstRunning >= 0.5;
  const endEngine = repower ? (freshLikely ? freshEngine : start) : start;
  run.endEngine = endEngine;
  run.endAge = endEngine.overhaulCost > 0 ? endEngine.lifeHours * (1 - credit / (endEngine.overhaulCost * gN)) : endEngine.lifeHours;
  run.discounted = d;
  run.depreciation = depreciation;
  run.depreciated = depreciated;
  run.residualCredit = credit;
  run.eventCounts = counts;
  run.quantities = quantities;
  run.failureBeforePlanned = q.failureBeforePlanned;
  run.npv = npvFromTotals(d, a.taxRate, expense, discountFactor[n], credit);
  return run;
}
