/**
 * Timing options of one truck (issue 15): `keep`, `rebuild`, repower `now`,
 * and repower at the k-th planned event of the engine fitted today
 * (k = 1, 2, …), optionally delayed by d months of operating hours past the
 * due date. Pure; expected valuation (MODEL.md section 11).
 *
 * ## The option (k, d)
 *
 * The engine fitted today (age a0) and the engines after it follow the
 * rebuild rule (MODEL.md section 3) for lives 1 … k − 1: each life ends at
 * its planned life ℓ (an overhaul) or at its failure age first (a repair).
 * Life k is ended by the repower: at its planned end — ℓ plus the delay
 * δ = d · annualHours / 12 hours (the old engine runs on past its planned
 * life) — a planned swap (core credit), or at its failure age first a failed
 * swap (failed core credit, the larger of the offer's and the old engine's
 * failure days down, no repair booked). The new engine then follows the
 * rebuild rule with its own figures. Life 1 has planned length
 * max(0, ℓ − a0) (+ δ when k = 1): an engine at or past its life has its
 * planned event now, in period 0.
 *
 * k = 1, d = 0 is the case's `repower` at-overhaul and is computed by the
 * engine itself (expected.ts / simulate.ts): every figure is the same. `now`
 * is the case's repower with timing "now"; `keep` and `rebuild` are the
 * case's policies.
 *
 * ## Planned swap month and capital
 *
 * With no failure before it, the swap of (k, d) falls at
 * s = max(0, ℓ − a0) + (k − 1)·ℓ + δ hours from today: month
 * m = floor(s / (annualHours/12) + 1e-9) (0 = this month), period y = the year
 * whose hours hold s (section 3's rule: the year's last hour included; period 0
 * when s = 0). Planned capital = (modulePrice + installCost − coreCredit) at
 * period y's prices, positive money, in that period alone. An option whose
 * planned swap is at or past the end of the horizon is not offered.
 *
 * ## Expectation (k ≥ 2 or d > 0)
 *
 * The law of the start of each life is carried on cells of width g
 * (g = ℓ/K, renewal.ts's `gridStep` of the old engine) over the hours from
 * today, plus one atom (every earlier life ended as planned). A life's end
 * law is the start law convolved with its life law: failure masses exactly
 * from the Weibull CDF from an atom, by the midpoint rule from a cell; the
 * planned end is the start law shifted by the planned length (an atom moves
 * exactly, cells by whole cells, a fraction split linearly between two cells)
 * and scaled by R(planned length). Counts by year are masses within each year
 * (a cell's mass spread evenly over it). The old engine's services are the
 * lives' service probabilities R(mI) on the start laws shifted by mI; its
 * hours ∫ P(S > τ) dτ; its residual share E[R(x)·max(0, 1 − x/ℓ)] at the
 * end. The new engine's process after the swap time S reads the renewal
 * tables (renewal.ts) at b − S, with the planned-overhaul chain and service
 * steps integrated against S's cells evenly, as expected.ts does for one life.
 * Money then follows sections 2–8 from these expected quantities exactly as
 * in expected.ts. Accuracy: the scheme is second order in g; the test
 * against a plain sampled simulation (tests/unit/engine/timing.test.ts)
 * holds it within 3 standard errors, and the same scheme run for k = 1,
 * d = 0 agrees with expected.ts to well within MODEL.md's tolerance.
 *
 * Under the median-path valuation only keep, rebuild, now and k = 1, d = 0
 * are offered (the engine's own policies).
 *
 * ## Worked example (tests/unit/engine/timing.test.ts)
 *
 * scenarios/one-truck.json: the old engine at 16,500 h of a 20,000 h life,
 * 6,000 h a year. k = 1, d = 0: planned swap after 3,500 h, month
 * floor(3,500 / 500) = 7, period 1, capital 1,540,000 (1,500,000 + 140,000
 * − 100,000) at year-1 prices; k = 2: after 3,500 + 20,000 h, past the
 * 18,000 h horizon, not offered.
 */
import type { CaseFileInput, Engine } from '@/lib/validation/case';
import { assembleCashFlows, npvFromTotals } from './cash-flow';
import { bookExpectedPeriod, depreciationPv, expectedPolicyRun } from './expected';
import { policyResult } from './results';
import { creditShare, gridStep, readTable, renewalTable, servicesByAge, type RenewalTable } from './renewal';
import { buildCaseYearTables, buildTruckSetup, resolveAssumptions, resolveOffer, resolveTruck, type ResolvedOffer, type TruckSetup } from './setup';
import { clearTotals, emptyPeriod, emptyPolicyRun, simulatePolicy, type PolicyRun } from './simulate';
import { ZERO } from './time-value';
import { type EventCounts, type PeriodQuantities, type PolicyKey, type PolicyResult } from './types';

export type TimingKind = 'keep' | 'rebuild' | 'now' | 'event';

export interface TimingSpec {
  kind: TimingKind;
  /** the k-th planned event (kind "event"), else 0 */
  k: number;
  /** months of delay past the due date (kind "event"), else 0 */
  delayMonths: number;
}

export interface TimingOption extends TimingSpec {
  key: string;
  label: string;
  /** planned swap month from today (0 = this month), null without a swap */
  swapMonth: number | null;
  /** hours from today of the planned swap, null without a swap */
  swapHours: number | null;
  /** period of the planned swap, null without a swap */
  swapPeriod: number | null;
  /** planned capital by period 0..N, positive money (the planned swap only; no failure before it) */
  plannedCapital: number[];
  /** the option's result (expected valuation): npv, cash flows, breakdown with the expected capital, events */
  result: PolicyResult;
  npv: number;
}

const YEAR_MONTHS = 12;

/** A truck's setup from a case (validated by the caller). */
export function truckSetupOf(c: CaseFileInput, truckId: string): TruckSetup {
  const a = resolveAssumptions(c.assumptions);
  const engines = new Map<string, Engine>(c.engines.map((e) => [e.id, e]));
  const offers = new Map<string, ResolvedOffer>(c.repowerOffers.map((o) => [o.id, resolveOffer(o)]));
  const input = c.trucks.find((t) => t.id === truckId);
  if (!input) throw new Error(`no truck with id "${truckId}"`);
  return buildTruckSetup(resolveTruck(input), a, engines, offers, buildCaseYearTables(a, c.trucks));
}

/** Hours from today of the planned swap of (k, d) with no failure before it. */
export function plannedSwapHours(setup: TruckSetup, k: number, delayMonths: number): number {
  const e = setup.start;
  return Math.max(0, e.lifeHours - setup.truck.engineHours) + (k - 1) * e.lifeHours + (delayMonths * setup.truck.annualHours) / YEAR_MONTHS;
}

/** The period whose hours hold hour s from today (0 when s = 0); N + 1 when past the horizon (the last hour of N does not happen). */
export function periodOfHour(setup: TruckSetup, s: number): number {
  if (s <= ZERO) return 0;
  let end = 0;
  for (let y = 1; y <= setup.n; y++) {
    end += setup.hours[y];
    if (y < setup.n ? s <= end + ZERO : s < end - ZERO) return y;
  }
  return setup.n + 1;
}

function label(spec: TimingSpec): string {
  if (spec.kind === 'keep') return 'Keep (run to failure)';
  if (spec.kind === 'rebuild') return 'Rebuild (never repower)';
  if (spec.kind === 'now') return 'Repower now';
  const nth = spec.k === 1 ? 'next planned overhaul' : `planned overhaul no. ${spec.k}`;
  return `Repower at the ${nth}${spec.delayMonths > 0 ? `, ${spec.delayMonths} month${spec.delayMonths > 1 ? 's' : ''} late` : ''}`;
}

export function timingKey(spec: TimingSpec): string {
  if (spec.kind !== 'event') return spec.kind;
  return spec.delayMonths > 0 ? `k${spec.k}+d${spec.delayMonths}` : `k${spec.k}`;
}

/** The run of an option (expected valuation unless the case asks for the median path). */
export function timingRun(setup: TruckSetup, spec: TimingSpec, forceGeneral = false): PolicyRun {
  const median = setup.a.valuation === 'median-path';
  const policyRun = (policy: PolicyKey, s: TruckSetup) => (median ? simulatePolicy(s, policy) : expectedPolicyRun(s, policy));
  if (spec.kind === 'keep' || spec.kind === 'rebuild') return policyRun(spec.kind, setup);
  if (spec.kind === 'now') return policyRun('repower', { ...setup, offer: { ...setup.offer, timing: 'now' } });
  if (spec.k === 1 && spec.delayMonths === 0 && !forceGeneral) {
    return policyRun('repower', { ...setup, offer: { ...setup.offer, timing: 'at-overhaul' } });
  }
  if (median) throw new Error('timing options past the next overhaul, or delayed, need the expected valuation');
  return generalRun(setup, spec.k, (spec.delayMonths * setup.truck.annualHours) / YEAR_MONTHS);
}

/** One option's figures (see the module comment). */
export function timingOption(setup: TruckSetup, spec: TimingSpec): TimingOption {
  const run = timingRun(setup, spec);
  const cash = assembleCashFlows(setup, run);
  const result = policyResult(cash, setup.discountFactor, setup.a.discountRate, setup.a.taxRate);
  const plannedCapital = new Array<number>(setup.n + 1).fill(0);
  let swapHours: number | null = null;
  let swapPeriod: number | null = null;
  let swapMonth: number | null = null;
  if (spec.kind !== 'keep' && spec.kind !== 'rebuild') {
    swapHours = spec.kind === 'now' ? 0 : plannedSwapHours(setup, spec.k, spec.delayMonths);
    swapPeriod = periodOfHour(setup, swapHours);
    swapMonth = Math.floor(swapHours / (setup.truck.annualHours / YEAR_MONTHS) + 1e-9);
    const o = setup.offer;
    if (swapPeriod <= setup.n) plannedCapital[swapPeriod] = (o.modulePrice + o.installCost - o.coreCredit) * setup.generalIndex[swapPeriod];
  }
  return { ...spec, key: timingKey(spec), label: label(spec), swapHours, swapPeriod, swapMonth, plannedCapital, result, npv: result.npv };
}

/**
 * Every timing option of a truck: keep, rebuild, now, and (k, d) for
 * k = 1, 2, … and d = 0 … maxDelayMonths while the planned swap falls within
 * the horizon (k = 1, d = 0 always, as the case's repower). Median path: only
 * d = 0, k = 1.
 */
export function timingOptions(setup: TruckSetup, opts: { maxK?: number; maxDelayMonths?: number } = {}): TimingOption[] {
  const median = setup.a.valuation === 'median-path';
  const maxK = median ? 1 : opts.maxK ?? 3;
  const maxDelay = median ? 0 : opts.maxDelayMonths ?? 0;
  const out: TimingOption[] = [
    timingOption(setup, { kind: 'keep', k: 0, delayMonths: 0 }),
    timingOption(setup, { kind: 'rebuild', k: 0, delayMonths: 0 }),
    timingOption(setup, { kind: 'now', k: 0, delayMonths: 0 }),
  ];
  for (let k = 1; k <= maxK; k++) {
    for (let d = 0; d <= maxDelay; d++) {
      if (!(k === 1 && d === 0) && periodOfHour(setup, plannedSwapHours(setup, k, d)) > setup.n) continue;
      out.push(timingOption(setup, { kind: 'event', k, delayMonths: d }));
    }
  }
  return out;
}

// ------------------------------------------------------------ the general option

/** A law over hours from today: point atoms and cell masses (cell c spread evenly over [c·g, (c+1)·g)). */
interface Law {
  atoms: { t: number; p: number }[];
  cells: Float64Array;
}

interface Grid {
  g: number;
  n: number;
  T: number;
}

function emptyLaw(grid: Grid): Law {
  return { atoms: [], cells: new Float64Array(grid.n) };
}

function hazard(e: Engine, x: number): number {
  return x <= 0 ? 0 : Math.pow(x / e.weibullScaleHours, e.weibullShape);
}

/** Mass of a law in (a, b] (cells evenly; atoms with the year rule: an atom exactly at the horizon's end is not booked). */
function massIn(law: Law, grid: Grid, a: number, b: number, first: boolean, last: boolean): number {
  let v = 0;
  for (const at of law.atoms) {
    const inLow = first ? at.t >= -ZERO : at.t > a + ZERO;
    const inHigh = last ? at.t < b - ZERO : at.t <= b + ZERO;
    if (inLow && inHigh) v += at.p;
  }
  const { g, n } = grid;
  const c0 = Math.max(0, Math.floor(a / g));
  const c1 = Math.min(n - 1, Math.floor(b / g));
  for (let c = c0; c <= c1; c++) {
    const m = law.cells[c];
    if (m === 0) continue;
    const lo = c * g;
    const overlap = Math.min(b, lo + g) - Math.max(a, lo);
    if (overlap > 0) v += (m * overlap) / g;
  }
  return v;
}

/** P(law ≤ x), cells evenly (a prefix of the cells, read at x). */
function cdf(law: Law, prefix: Float64Array, grid: Grid, x: number): number {
  let v = 0;
  for (const at of law.atoms) if (at.t <= x + ZERO) v += at.p;
  if (x <= 0) return v;
  const p = x / grid.g;
  const c = Math.floor(p);
  if (c >= grid.n) return v + prefix[grid.n];
  return v + prefix[c] + law.cells[c] * (p - c);
}

function prefixOf(law: Law): Float64Array {
  const out = new Float64Array(law.cells.length + 1);
  for (let c = 0; c < law.cells.length; c++) out[c + 1] = out[c] + law.cells[c];
  return out;
}

/** Add `mass` of failures of a life started at u, alive on (u, u + λ), failure CDF F(s) (s hours into the life), to cells. */
function addFailures(out: Float64Array, grid: Grid, u: number, lambda: number, mass: number, F: (s: number) => number): void {
  const { g, n } = grid;
  const end = Math.min(u + lambda, grid.T);
  if (!(end > u)) return;
  let c = Math.max(0, Math.floor(u / g));
  let prev = 0;
  for (; c < n; c++) {
    const hi = Math.min((c + 1) * g, end);
    if (hi <= u) continue;
    const now = F(hi - u);
    out[c] += mass * (now - prev);
    prev = now;
    if (hi >= end) break;
  }
}

/** Add a law's cells shifted by `shift` hours, times `factor`, to `out` (a fraction of a cell split linearly). */
function addShifted(out: Float64Array, cells: Float64Array, shift: number, factor: number): void {
  const n = out.length;
  const whole = Math.floor(shift + 1e-9);
  const frac = shift - whole < 1e-9 ? 0 : shift - whole;
  for (let c = 0; c < cells.length; c++) {
    const m = cells[c];
    if (m === 0) continue;
    const to = c + whole;
    if (to >= n) break;
    out[to] += m * factor * (1 - frac);
    if (frac > 0 && to + 1 < n) out[to + 1] += m * factor * frac;
  }
}

interface LifeLaws {
  /** start law of each life j = 1..k (index j − 1) */
  starts: Law[];
  /** planned length of each life */
  lambda: number[];
  /** end of each life: planned and failed parts */
  planned: Law[];
  failed: Law[];
}

/** One life of the old engine: its end laws from its start law, and the start law of the next life. */
interface Life {
  start: Law;
  lambda: number;
  planned: Law;
  failed: Law;
  next: Law;
}

function oneLife(setup: TruckSetup, start: Law, j: number, lam: number, grid: Grid): Life {
  const e = setup.start;
  const a0 = setup.truck.engineHours;
  const h0 = hazard(e, a0);
  const { g } = grid;
  const first = j === 1;
  // survival and failure CDF of this life, s hours into it
  const F = first ? (s: number) => -Math.expm1(h0 - hazard(e, a0 + s)) : (s: number) => -Math.expm1(-hazard(e, s));
  const survive = first ? Math.exp(h0 - hazard(e, a0 + lam)) : Math.exp(-hazard(e, lam));
  const fail = emptyLaw(grid);
  const plan = emptyLaw(grid);
  for (const at of start.atoms) {
    addFailures(fail.cells, grid, at.t, lam, at.p, F);
    plan.atoms.push({ t: at.t + lam, p: at.p * survive });
  }
  // from a cell (its mass at the centre): the same kernel for every cell, kernel_i = F((i + ½)g ∧ λ) − F((i − ½)g ∧ λ)
  const kernel: number[] = [];
  for (let i = 0; (i - 0.5) * g < lam; i++) kernel.push(F(Math.min((i + 0.5) * g, lam)) - (i === 0 ? 0 : F(Math.min((i - 0.5) * g, lam))));
  for (let c = 0; c < grid.n; c++) {
    const m = start.cells[c];
    if (m === 0) continue;
    const top = Math.min(kernel.length, grid.n - c);
    for (let i = 0; i < top; i++) fail.cells[c + i] += m * kernel[i];
  }
  addShifted(plan.cells, start.cells, lam / g, survive);
  const next = emptyLaw(grid);
  next.atoms = plan.atoms.filter((a) => a.t < grid.T - ZERO);
  for (let c = 0; c < grid.n; c++) next.cells[c] = fail.cells[c] + plan.cells[c];
  return { start, lambda: lam, planned: plan, failed: fail, next };
}

/**
 * The undelayed lives of a truck's old engine, shared by all its options: lives 1 … k − 1 of option (k, d) do
 * not depend on k or d (only the last life carries the delay), so each is computed once per setup and grid.
 * The same arithmetic in the same order: every figure is what computing them afresh gives.
 */
const undelayedLives = new WeakMap<TruckSetup, { g: number; n: number; lives: Life[] }>();

function undelayedLife(setup: TruckSetup, j: number, grid: Grid): Life {
  let chain = undelayedLives.get(setup);
  if (!chain || chain.g !== grid.g || chain.n !== grid.n) {
    chain = { g: grid.g, n: grid.n, lives: [] };
    undelayedLives.set(setup, chain);
  }
  const l = setup.start.lifeHours;
  while (chain.lives.length < j) {
    const i = chain.lives.length + 1;
    const start: Law = i === 1 ? { atoms: [{ t: 0, p: 1 }], cells: new Float64Array(grid.n) } : chain.lives[i - 2].next;
    chain.lives.push(oneLife(setup, start, i, i === 1 ? Math.max(0, l - setup.truck.engineHours) : l, grid));
  }
  return chain.lives[j - 1];
}

/** The start and end laws of lives 1..k of the old engine (see the module comment). */
function lifeLaws(setup: TruckSetup, k: number, delay: number, grid: Grid): LifeLaws {
  const l = setup.start.lifeHours;
  const a0 = setup.truck.engineHours;
  const starts: Law[] = [];
  const lambda: number[] = [];
  const planned: Law[] = [];
  const failed: Law[] = [];
  for (let j = 1; j <= k; j++) {
    const life = j < k || delay === 0
      ? undelayedLife(setup, j, grid)
      : oneLife(setup, j === 1 ? { atoms: [{ t: 0, p: 1 }], cells: new Float64Array(grid.n) } : undelayedLife(setup, j - 1, grid).next, j, (j === 1 ? Math.max(0, l - a0) : l) + delay, grid);
    starts.push(life.start);
    lambda.push(life.lambda);
    planned.push(life.planned);
    failed.push(life.failed);
  }
  return { starts, lambda, planned, failed };
}

/** Per-year masses of a law (massIn over each period, as optionQuantities books them), cached by the law: shared lives are booked once. */
const yearMasses = new WeakMap<Law, Float64Array>();

/** Per-year service masses of a start law shifted by m service intervals, cached by the law and m. */
const serviceMasses = new WeakMap<Law, Map<number, Float64Array>>();

/** Per-period expected quantities of a general option. */
interface OptionQuantities {
  oldOverhauls: Float64Array;
  oldRepairs: Float64Array;
  plannedSwaps: Float64Array;
  failedSwaps: Float64Array;
  newOverhauls: Float64Array;
  newRepairs: Float64Array;
  oldServices: Float64Array;
  newServices: Float64Array;
  oldHours: Float64Array;
  oldShare: number;
  newShare: number;
  oldRunning: number;
  failureBeforePlanned: number;
}

function optionQuantities(setup: TruckSetup, k: number, delay: number): OptionQuantities {
  const { n, hours } = setup;
  const e = setup.start;
  const ends = new Float64Array(n + 1);
  for (let y = 1; y <= n; y++) ends[y] = ends[y - 1] + hours[y];
  const T = ends[n];
  const g = gridStep(e, T);
  const grid: Grid = { g, n: Math.ceil(T / g) + 1, T };
  const laws = lifeLaws(setup, k, delay, grid);
  const perYear = () => new Float64Array(n + 1);
  const q: OptionQuantities = {
    oldOverhauls: perYear(), oldRepairs: perYear(), plannedSwaps: perYear(), failedSwaps: perYear(), newOverhauls: perYear(),
    newRepairs: perYear(), oldServices: perYear(), newServices: perYear(), oldHours: perYear(), oldShare: 0, newShare: 0, oldRunning: 0,
    failureBeforePlanned: 0,
  };
  const inYear = (law: Law, y: number) => {
    let masses = yearMasses.get(law);
    if (!masses) {
      masses = new Float64Array(n + 1);
      for (let z = 0; z <= n; z++) masses[z] = massIn(law, grid, z === 0 ? -1 : ends[z - 1], ends[z], z === 0, z === n);
      yearMasses.set(law, masses);
    }
    return masses[y];
  };
  for (let y = 0; y <= n; y++) {
    for (let j = 0; j < k; j++) {
      const isSwap = j === k - 1;
      (isSwap ? q.plannedSwaps : q.oldOverhauls)[y] += inYear(laws.planned[j], y);
      (isSwap ? q.failedSwaps : q.oldRepairs)[y] += y === 0 ? 0 : inYear(laws.failed[j], y);
    }
  }
  // the swap time S: planned and failed parts together
  const swap: Law = { atoms: laws.planned[k - 1].atoms.filter((a) => a.t < T - ZERO), cells: new Float64Array(grid.n) };
  for (let c = 0; c < grid.n; c++) swap.cells[c] = laws.planned[k - 1].cells[c] + laws.failed[k - 1].cells[c];
  const swapPrefix = prefixOf(swap);

  // old engine's services: life 1 exactly; lives 2..k on their start laws shifted by mI
  const I = e.serviceIntervalHours;
  const a0 = setup.truck.engineHours;
  const h0 = hazard(e, a0);
  const lam1 = laws.lambda[0];
  const periodOf = (t: number) => {
    for (let y = 1; y <= n; y++) if (t <= ends[y] + ZERO) return y;
    return n;
  };
  if (lam1 > 0) {
    for (let m = Math.floor((a0 + ZERO) / I) + 1; ; m++) {
      const t = m * I - a0;
      if (t > T + ZERO) break;
      // the planned end includes the oil change, except a planned end at the very end, which does not happen
      if (t >= lam1 - ZERO && !(Math.abs(lam1 - T) <= ZERO && t <= lam1 + ZERO)) break;
      const alive = Math.exp(h0 - hazard(e, m * I));
      if (alive < 1e-17) break;
      q.oldServices[periodOf(t)] += alive;
    }
  }
  for (let j = 1; j < k; j++) {
    const start = laws.starts[j];
    const lam = laws.lambda[j];
    for (let m = 1; m * I < lam - ZERO; m++) {
      const p = Math.exp(-hazard(e, m * I));
      if (p < 1e-17) break;
      let byM = serviceMasses.get(start);
      if (!byM) serviceMasses.set(start, (byM = new Map()));
      let masses = byM.get(m);
      if (!masses) {
        masses = new Float64Array(n + 1);
        const shifted: Law = { atoms: start.atoms.map((a) => ({ t: a.t + m * I, p: a.p })), cells: new Float64Array(grid.n) };
        addShifted(shifted.cells, start.cells, (m * I) / g, 1);
        for (let y = 1; y <= n; y++) masses[y] = p * massIn(shifted, grid, ends[y - 1], ends[y], false, false) + 0;
        byM.set(m, masses);
      }
      for (let y = 1; y <= n; y++) q.oldServices[y] += masses[y];
    }
  }
  // old engine's hours: ∫ P(S > τ) dτ per year; ∫₀ˣ CDF_S = Σ mass · E[max(0, x − position)]
  const intCdf = (x: number) => {
    let v = 0;
    for (const at of swap.atoms) if (at.t < x) v += at.p * (x - at.t);
    for (let c = 0; c < grid.n; c++) {
      const m = swap.cells[c];
      if (m === 0) continue;
      const lo = c * g;
      if (x <= lo) break;
      v += x >= lo + g ? m * (x - lo - g / 2) : (m * (x - lo) * (x - lo)) / (2 * g);
    }
    return v;
  };
  // the swap at time 0 (λ₁ = 0, k = 1) leaves no old hours
  let prevInt = 0;
  for (let y = 1; y <= n; y++) {
    const now = intCdf(ends[y]);
    q.oldHours[y] = Math.max(0, hours[y] - (now - prevInt));
    prevInt = now;
  }
  q.oldRunning = Math.max(0, 1 - cdf(swap, swapPrefix, grid, T - ZERO) + 0);
  // old engine's residual share: the life alive at T, j = 1..k
  let oldShare = 0;
  if (lam1 > T - ZERO || k > 1) {
    if (T < lam1 + ZERO) oldShare += Math.exp(h0 - hazard(e, a0 + T)) * Math.max(0, 1 - (a0 + T) / e.lifeHours);
    for (let j = 1; j < k; j++) {
      const start = laws.starts[j];
      const J = (x: number) => (x >= 0 && x < Math.min(laws.lambda[j], e.lifeHours) ? Math.exp(-hazard(e, x)) * (1 - x / e.lifeHours) : 0);
      for (const at of start.atoms) oldShare += at.p * J(T - at.t);
      for (let c = 0; c < grid.n; c++) if (start.cells[c] > 0) oldShare += start.cells[c] * J(T - (c + 0.5) * g);
    }
  }
  q.oldShare = oldShare;
  q.failureBeforePlanned = lam1 <= 0 ? 0 : -Math.expm1(h0 - hazard(e, a0 + Math.min(lam1, T)));

  // the new engine after S (renewal tables of the repower engine)
  const next = setup.next;
  const h = gridStep(next, T);
  const table = renewalTable(next, 'rebuild', h, T);
  const cellCdf = (x: number) => {
    if (x <= 0) return 0;
    const p = x / g;
    const c = Math.floor(p);
    const cellsOnly = swapPrefix;
    if (c >= grid.n) return cellsOnly[grid.n];
    return cellsOnly[c] + swap.cells[c] * (p - c);
  };
  const overCells = (tab: Float64Array, x: number) => {
    let v = 0;
    for (let c = 0; c < grid.n; c++) {
      const m = swap.cells[c];
      if (m === 0) continue;
      const t = x - (c + 0.5) * g;
      if (t <= 0) break;
      v += m * readTable(tab, h, t);
    }
    return v;
  };
  const qm = table.serviceProbability;
  const cum = (b: number, last: boolean) => {
    let repairs = 0;
    let overhauls = 0;
    let services = 0;
    for (const at of swap.atoms) {
      if (!(last ? at.t < b - ZERO : at.t <= b + ZERO)) continue;
      const x = b - at.t;
      repairs += at.p * readTable(table.U, h, x);
      services += at.p * readTable(table.CV, h, x);
      let w = 1;
      for (let j = 0; ; j++) {
        const xj = x - j * table.life;
        if (xj < -ZERO || w < 1e-17) break;
        if (j >= 1) {
          const tau = at.t + j * table.life;
          if (last ? tau < b - ZERO : tau <= b + ZERO) overhauls += at.p * w;
          overhauls += at.p * w * readTable(table.U, h, xj);
        }
        services += at.p * w * servicesByAge(table, xj);
        w *= table.chain;
      }
    }
    repairs += overCells(table.U, b);
    services += overCells(table.CV, b);
    let w = 1;
    for (let j = 0; ; j++) {
      const xj = b - j * table.life;
      if (xj <= 0 || w < 1e-17) break;
      if (j >= 1) {
        overhauls += w * cellCdf(xj);
        overhauls += w * overCells(table.U, xj);
      }
      for (let m = 0; m < qm.length; m++) {
        const s = xj - (m + 1) * table.interval;
        if (s <= 0) break;
        services += w * qm[m] * cellCdf(s);
      }
      w *= table.chain;
    }
    return { repairs, overhauls, services };
  };
  let prev = { repairs: 0, overhauls: 0, services: 0 };
  for (let y = 0; y <= n; y++) {
    const c = cum(ends[y], y === n);
    q.newRepairs[y] = c.repairs - prev.repairs;
    q.newOverhauls[y] = c.overhauls - prev.overhauls;
    q.newServices[y] = c.services - prev.services;
    prev = c;
  }
  q.newShare = newCreditShare(swap, grid, table, T);
  return q;
}

function newCreditShare(swap: Law, grid: Grid, t: RenewalTable, T: number): number {
  let v = 0;
  const points: { s: number; p: number }[] = swap.atoms.map((a) => ({ s: a.t, p: a.p }));
  for (let c = 0; c < grid.n; c++) if (swap.cells[c] > 0) points.push({ s: (c + 0.5) * grid.g, p: swap.cells[c] });
  for (const { s, p } of points) {
    const x = T - s;
    if (x <= ZERO) continue;
    let w = 1;
    for (let j = 0; ; j++) {
      const xj = x - j * t.life;
      if (xj <= ZERO || w < 1e-17) break;
      v += p * w * creditShare(t, xj);
      w *= t.chain;
    }
    v += p * readTable(t.CR, t.h, x);
  }
  return v;
}

/** The expected run of option (k, δ hours of delay), assembled as expected.ts assembles a policy's. */
function generalRun(setup: TruckSetup, k: number, delay: number): PolicyRun {
  const { truck, a, offer, n, hours, generalIndex, discountFactor } = setup;
  const q = optionQuantities(setup, k, delay);
  const run = emptyPolicyRun();
  const periods = run.periods;
  for (let y = 0; y <= n; y++) periods.push(emptyPeriod());
  const st = run.state;
  st.setup = setup;
  st.policy = 'repower';
  const log = st.log;
  const d = st.d;
  clearTotals(d);
  const depreciation = st.depreciation;
  for (let y = 0; y <= n; y++) depreciation[y] = 0;
  let depreciated = false;
  const expense = a.rebuildAccounting === 'expense';
  const counts: EventCounts[] = [];
  const quantities: PeriodQuantities[] = [];
  const old = setup.start;
  const fresh = setup.next;
  const tph0 = truck.tonnesPerHour;
  const extraTph = tph0 * offer.productivityGain;
  const tphNew = tph0 + extraTph;
  const plannedSwap = offer.modulePrice + offer.installCost - offer.coreCredit;
  const failedSwap = offer.modulePrice + offer.installCost - offer.failedCoreCredit;
  const failedSwapDays = Math.max(offer.downtimeDays, old.failureDowntimeDays);
  for (let y = 0; y <= n; y++) {
    const idx = generalIndex[y];
    const p = periods[y];
    const ov = q.oldOverhauls[y] + q.newOverhauls[y];
    const rep = q.oldRepairs[y] + q.newRepairs[y];
    const pow = q.plannedSwaps[y] + q.failedSwaps[y];
    const capital = (q.plannedSwaps[y] * plannedSwap + q.failedSwaps[y] * failedSwap) * idx;
    const daysOld = q.oldOverhauls[y] * old.overhaulDowntimeDays + q.oldRepairs[y] * old.failureDowntimeDays
      + q.plannedSwaps[y] * offer.downtimeDays + q.failedSwaps[y] * failedSwapDays;
    const daysNew = q.newOverhauls[y] * fresh.overhaulDowntimeDays + q.newRepairs[y] * fresh.failureDowntimeDays;
    const lostTonnes = (daysOld * tph0 + daysNew * tphNew) * (truck.annualHours / 365);
    const lost = lostTonnes * a.marginPerTonne * a.lostMarginShare * idx;
    counts.push({ overhauls: ov, repairs: rep, repowers: pow });
    const overhaulCost = (q.oldOverhauls[y] * old.overhaulCost + q.newOverhauls[y] * fresh.overhaulCost) * idx;
    const repairCost = (q.oldRepairs[y] * old.failureCost + q.newRepairs[y] * fresh.failureCost) * idx;
    const hy = hours[y];
    const oldHours = q.oldHours[y];
    const newHours = hy - oldHours;
    const lubePrice = a.lubePrice * idx;
    const serviceCost = (e: Engine) => e.sumpLitres * lubePrice + e.serviceKitCost * idx + e.serviceLabourHours * a.labourRate * idx;
    const topUp = old.topUpLitresPerHour * oldHours + fresh.topUpLitresPerHour * newHours;
    const lube = q.oldServices[y] * serviceCost(old) + q.newServices[y] * serviceCost(fresh) + topUp * lubePrice;
    quantities.push({
      servicesStart: q.oldServices[y], servicesNew: q.newServices[y], overhauls: ov, repairs: rep,
      plannedRepowers: q.plannedSwaps[y], failedRepowers: q.failedSwaps[y], lostTonnes,
    });
    if (
      bookExpectedPeriod(setup, y, p, st, {
        hours: hy, oldHours, newHours, tph0, extraTph, oilServices: q.oldServices[y] + q.newServices[y], topUp,
        downtimeDays: daysOld + daysNew, lube, overhaulCost, repairCost, capital, lost,
      })
    )
      depreciated = true;
  }
  if (depreciated) d.depreciation = depreciationPv(depreciation, discountFactor, n);
  const gN = generalIndex[n];
  const credit = (old.overhaulCost * q.oldShare + fresh.overhaulCost * q.newShare) * gN;
  const freshLikely = 1 - q.oldRunning >= 0.5;
  const endEngine = freshLikely ? fresh : old;
  run.policy = 'repower';
  run.log = log;
  run.segments = [];
  run.events = [];
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
