/**
 * Renewal tables of one engine type (MODEL.md section 11): what a fresh
 * engine of that type — new, overhauled or repaired at time 0, age 0 — and
 * every engine after it do on average, as functions of the hours t run since
 * that start. The expected valuation (expected.ts) convolves them with the
 * law of the first life's end.
 *
 * ## The process
 *
 * Each life has a failure age X with R(x) = P(X > x) = exp(−(x/η)^β).
 * Under `rebuild` a life ends at min(X, ℓ) (ℓ = lifeHours): a repair when
 * X < ℓ, a planned overhaul otherwise (probability R(ℓ)); under `keep` at X.
 *
 * ## The tables, on the grid t_i = i·h (h = ℓ/K, so every ℓ is a grid point)
 *
 * - U(t), expected repairs (failures) in (0, t]. With G the law of the time to
 *   the first failure — survival S_G(t) = R(ℓ)^k · R(t − kℓ), k = ⌊t/ℓ⌋
 *   (rebuild: planned overhauls before it), R(t) (keep) — U solves the
 *   renewal equation U(t) = G(t) + ∫₀ᵗ U(t − u) dG(u). Solved by the
 *   Riemann–Stieltjes midpoint scheme of Xie (1989, "On the solution of
 *   renewal-type integral equations", Commun. Statist. Simulation 18(1)):
 *   U_i = [G_i + ΔG_1·U_{i−1}/2 + Σ_{j≥2} ΔG_j·(U_{i−j} + U_{i−j+1})/2] / (1 − ΔG_1/2),
 *   ΔG_j = S_G(t_{j−1}) − S_G(t_j) (survival differences keep their digits
 *   where G is near 1). G is continuous (no atom), so U is continuous.
 * - Planned overhauls are those of a "chain": after a start at time u, the
 *   k-th planned overhaul comes at u + kℓ with probability R(ℓ)^k. The
 *   starts are the fresh start at 0 (an atom) and the repairs (continuous),
 *   so overhauls in (0, t] = Σ_{k≥1} R(ℓ)^k·(1[t ≥ kℓ] + U(t − kℓ)). The
 *   atoms are kept apart (exact); CM(t) = U(t) + Σ_{k≥1} R(ℓ)^k·U(t − kℓ)
 *   counts the continuous life starts.
 * - Oil services: a life alive at age mI (m ≥ 1, I the service interval;
 *   rebuild: mI < ℓ, the overhaul includes the oil change) has a service
 *   there, with probability q_m = R(mI). Services in (0, t] =
 *   Σ_{k≥0} R(ℓ)^k·Q(t − kℓ) (the chain from the atom at 0, Q(x) = Σ_{mI ≤ x} q_m,
 *   exact) + CV(t), CV(t) = Σ_m q_m·CM(t − mI) (the lives of the
 *   continuous starts).
 * - Residual: the credit share of the engine fitted at t, E[max(0, 1 − A(t)/ℓ)]
 *   with A(t) its age, = Σ_{k≥0} R(ℓ)^k·J(t − kℓ) + CR(t), J(x) = R(x)·(1 − x/ℓ)
 *   on [0, ℓ) and 0 elsewhere, CR(t) = ∫₀ᵗ J(t − u) dCM(u) (midpoint rule per
 *   grid cell of CM).
 *
 * Between grid points the tables are read by linear interpolation (all of
 * U, CM, CV and CR are continuous).
 *
 * ## Error
 *
 * The midpoint scheme and the linear interpolation are second order: the
 * error of U is at most about C·h²·max|u′| over the horizon, u the renewal
 * density. Below β = 1 the density is unbounded at the start of each life
 * and a cell's failure mass sits before its middle (the first cell's centre
 * of mass is at h·β/(1+β) as h → 0): the midpoint then leaves an
 * O(h^(1+β)) error, so the scheme reads U at each cell's centre of mass θ_j
 * instead, U(t_i − s) ≈ (1 − θ_j)·U_{i−j+1} + θ_j·U_{i−j} (θ_j by 8-point
 * Gauss–Legendre in v = (x/η)^β, where the integrand η·v^(1/β)·e^(−v) is
 * smooth; θ = ½ and the plain scheme for β ≥ 1, bit for bit). With
 * h ≤ min(ℓ, 3η/β)/200, finer by β⁻⁶ below β = 1 (at most 6,000 cells),
 * every expected count is within about 6·10⁻⁶ for β from 0.5 to 20 (about
 * 5·10⁻⁶ at β = 0.5 over 60,000 h, against 1.2·10⁻⁵ with the midpoint);
 * `tests/unit/engine/expected-valuation.test.ts` halves h and checks that no
 * amount moves by more than MODEL.md's bound, and compares the default grid
 * with one four times finer at β = 0.5, 0.6 and 0.8. The exponential case
 * β = 1 without planned life is exact to rounding (U(t) = t/η; the scheme is
 * exact for a linear U).
 *
 * ## Cost
 *
 * O(n·J) for U (J: the cells until S_G falls below 1e−17), O(n·K) for CR,
 * O(n·M) for CV, n = T/h ≤ 6,000 cells (a longer horizon coarsens h, and
 * the error grows as h²: the methodology page says so). Tables are cached by
 * engine figures, rule and h, so the trucks of a case and the re-evaluations
 * of a sensitivity share them.
 */
import { ZERO } from './time-value';

/** Cells per unit of min(ℓ, 3η/β) on the default grid. */
export const CELLS_PER_LIFE = 200;
/** Most cells a table has over the horizon. */
export const MAX_CELLS = 6000;
/** Survival below which the rest of a law is dropped. */
const TAIL = 1e-17;

export type RenewalRule = 'keep' | 'rebuild';

/** The engine figures the tables depend on. */
export interface RenewalEngine {
  weibullShape: number;
  weibullScaleHours: number;
  lifeHours: number;
  serviceIntervalHours: number;
}

export interface RenewalTable {
  rule: RenewalRule;
  /** grid step, hours */
  h: number;
  /** cells: the tables hold t_0..t_n */
  n: number;
  /** ℓ/h (rebuild), else 0 */
  k: number;
  life: number;
  /** R(ℓ) (rebuild), else 0: the chain's probability per planned life */
  chain: number;
  interval: number;
  U: Float64Array;
  CM: Float64Array;
  CV: Float64Array;
  CR: Float64Array;
  /** q_m for m = 1..M (index m − 1) and their prefix sums */
  serviceProbability: Float64Array;
  servicePrefix: Float64Array;
  /** R(x) of the engine */
  survival: (x: number) => number;
}

let refinement = 1;
/**
 * Divide every grid step by `factor` (1: the default grid). For the
 * convergence tests and the bench, which compare the default grid with
 * finer ones; returns the previous factor.
 */
export function setGridRefinement(factor: number): number {
  const previous = refinement;
  refinement = factor;
  cache.clear();
  gridGeneration += 1;
  return previous;
}

let gridGeneration = 0;
/** Changes whenever the grid does: a key part for caches of figures computed on it. */
export function gridVersion(): number {
  return gridGeneration;
}

/** The default grid step for an engine and a horizon of `hours`: h = ℓ/K. */
export function gridStep(e: RenewalEngine, hours: number): number {
  const base = Math.min(e.lifeHours, (e.weibullScaleHours * 3) / Math.max(3, e.weibullShape));
  // below β = 1 the density is unbounded at age 0 and the scheme converges more slowly: a finer grid
  const early = e.weibullShape < 1 ? Math.pow(1 / e.weibullShape, 6) : 1;
  const target = Math.max(base / (CELLS_PER_LIFE * early), hours / MAX_CELLS) / refinement;
  return e.lifeHours / Math.ceil(e.lifeHours / target);
}

/** Linear interpolation of a table at x hours (0 for x ≤ 0; the last value past the end). */
export function readTable(table: Float64Array, h: number, x: number): number {
  if (!(x > 0)) return 0;
  const p = x / h;
  const i = Math.floor(p);
  const last = table.length - 1;
  if (i >= last) return table[last];
  const f = p - i;
  return table[i] + f * (table[i + 1] - table[i]);
}

/** J(x) = R(x)·(1 − x/ℓ) on [0, ℓ), else 0: the credit share of a life x hours old. */
export function creditShare(t: RenewalTable, x: number): number {
  if (x < 0 || x >= t.life) return 0;
  return t.survival(x) * (1 - x / t.life);
}

/** Q(x) = Σ_{mI ≤ x} q_m: a life's expected services by age x (a service within 1e-6 h counts). */
export function servicesByAge(t: RenewalTable, x: number): number {
  if (x < 0) return 0;
  const m = Math.min(t.servicePrefix.length, Math.floor((x + ZERO) / t.interval));
  return m > 0 ? t.servicePrefix[m - 1] : 0;
}

/**
 * Build the tables for `cells` cells of step h (see the module comment).
 * Pure; O(n·(J + K + M)).
 */
export function buildRenewalTable(e: RenewalEngine, rule: RenewalRule, h: number, cells: number): RenewalTable {
  const beta = e.weibullShape;
  const eta = e.weibullScaleHours;
  const life = e.lifeHours;
  const survival = (x: number) => (x <= 0 ? 1 : Math.exp(-Math.pow(x / eta, beta)));
  const n = Math.max(1, Math.ceil(cells));
  const rebuild = rule === 'rebuild';
  const k = rebuild ? Math.round(life / h) : 0;
  const chain = rebuild ? survival(life) : 0;

  // survival of the time to the first failure at the grid points, until negligible
  const sg: number[] = [1];
  for (let i = 1; i <= n; i++) {
    let s: number;
    if (rebuild) {
      const lives = Math.floor(i / k);
      s = Math.pow(chain, lives) * survival((i - lives * k) * h);
    } else s = survival(i * h);
    sg.push(s);
    if (s < TAIL) break;
  }
  const jMax = sg.length - 1;
  const dG = new Float64Array(jMax + 1);
  for (let j = 1; j <= jMax; j++) dG[j] = sg[j - 1] - sg[j];

  const U = new Float64Array(n + 1);
  if (beta >= 1) {
    // W_k = (U_k + U_{k+1})/2, the cell averages the scheme reads (kept as they become known)
    const W = new Float64Array(n + 1);
    const denom = 1 - dG[1] / 2;
    for (let i = 1; i <= n; i++) {
      const g = i <= jMax ? 1 - sg[i] : 1;
      let acc = g + (dG[1] * U[i - 1]) / 2;
      const top = Math.min(i, jMax);
      for (let j = 2; j <= top; j++) acc += dG[j] * W[i - j];
      U[i] = acc / denom;
      W[i - 1] = (U[i - 1] + U[i]) * 0.5;
    }
  } else {
    // β < 1: the density is unbounded at the start of each life, and the mass of a cell near it sits
    // well before the cell's middle (the first cell's centre is at h·β/(1+β) as h → 0). U is read at
    // each cell's centre of mass θ_j (as a share of the cell): U(t_i − s) ≈ (1 − θ_j)·U_{i−j+1} + θ_j·U_{i−j},
    // which removes the O(h^(1+β)) term the midpoint leaves there.
    const theta = cellCentres(beta, eta, h, rebuild ? k : jMax, jMax);
    const lead = new Float64Array(jMax + 1);
    const lag = new Float64Array(jMax + 1);
    for (let j = 1; j <= jMax; j++) {
      const th = theta[rebuild ? (j - 1) % k : j - 1];
      lead[j] = dG[j] * (1 - th);
      lag[j] = dG[j] * th;
    }
    const denom = 1 - lead[1];
    for (let i = 1; i <= n; i++) {
      const g = i <= jMax ? 1 - sg[i] : 1;
      let acc = g + lag[1] * U[i - 1];
      const top = Math.min(i, jMax);
      for (let j = 2; j <= top; j++) acc += lead[j] * U[i - j + 1] + lag[j] * U[i - j];
      U[i] = acc / denom;
    }
  }

  const CM = new Float64Array(n + 1);
  for (let i = 0; i <= n; i++) {
    let v = U[i];
    if (rebuild) {
      let w = chain;
      for (let kk = 1; kk * k <= i && w > TAIL; kk++, w *= chain) v += w * U[i - kk * k];
    }
    CM[i] = v;
  }

  const table: RenewalTable = {
    rule, h, n, k, life, chain, interval: e.serviceIntervalHours, U, CM,
    CV: new Float64Array(n + 1), CR: new Float64Array(n + 1),
    serviceProbability: new Float64Array(0), servicePrefix: new Float64Array(0), survival,
  };

  // oil services of one life: q_m = R(mI) while alive (rebuild: mI < ℓ, the overhaul includes the oil change)
  const I = e.serviceIntervalHours;
  const q: number[] = [];
  for (let m = 1; m * I <= n * h + I; m++) {
    if (rebuild && m * I >= life - ZERO) break;
    const p = survival(m * I);
    if (p < TAIL) break;
    q.push(p);
  }
  table.serviceProbability = Float64Array.from(q);
  const prefix = new Float64Array(q.length);
  let run = 0;
  for (let m = 0; m < q.length; m++) prefix[m] = run += q[m];
  table.servicePrefix = prefix;
  for (let i = 0; i <= n; i++) {
    let v = 0;
    const t = i * h;
    for (let m = 0; m < q.length; m++) {
      const x = t - (m + 1) * I;
      if (x <= 0) break;
      v += q[m] * readTable(CM, h, x);
    }
    table.CV[i] = v;
  }

  // residual credit share of the lives of the continuous starts: ∫ J(t − u) dCM(u), midpoint per cell
  const jCells = Math.ceil(life / h);
  const J = new Float64Array(jCells + 1);
  for (let c = 0; c <= jCells; c++) J[c] = creditShare(table, (c + 0.5) * h);
  for (let i = 1; i <= n; i++) {
    let v = 0;
    const low = Math.max(1, i - jCells);
    for (let c = low; c <= i; c++) v += (CM[c] - CM[c - 1]) * J[i - c];
    table.CR[i] = v;
  }
  return table;
}

/** Gauss–Legendre nodes and weights on [0, 1], 8 points. */
const GL_X = [0.019855071751231856, 0.10166676129318664, 0.2372337950418355, 0.4082826787521751, 0.5917173212478249, 0.7627662049581645, 0.8983332387068134, 0.9801449282487681];
const GL_W = [0.05061426814518813, 0.11119051722668724, 0.15685332293894363, 0.18134189168918100, 0.18134189168918100, 0.15685332293894363, 0.11119051722668724, 0.05061426814518813];

/**
 * θ_m for the cells m = 0 .. count − 1 of a life (cell m spans (m·h, (m+1)·h] of age): the centre of mass of
 * the Weibull failure mass in the cell as a share of the cell, (E[X | cell] − m·h)/h. With v = (x/η)^β,
 * ∫ x dF = η·∫ v^(1/β) e^(−v) dv, a smooth integrand for β < 1 (8-point Gauss–Legendre in v per cell);
 * a cell whose mass is below 1e−300 gets ½.
 */
function cellCentres(beta: number, eta: number, h: number, count: number, limit: number): Float64Array {
  const m = Math.max(1, Math.min(count, limit));
  const out = new Float64Array(m);
  const inv = 1 / beta;
  for (let c = 0; c < m; c++) {
    const va = Math.pow((c * h) / eta, beta);
    const vb = Math.pow(((c + 1) * h) / eta, beta);
    const mass = Math.exp(-va) * -Math.expm1(va - vb);
    if (!(mass > 1e-300)) {
      out[c] = 0.5;
      continue;
    }
    let moment = 0;
    for (let q = 0; q < 8; q++) {
      const v = va + (vb - va) * GL_X[q];
      moment += GL_W[q] * Math.pow(v, inv) * Math.exp(-v);
    }
    moment *= (vb - va) * eta;
    const th = (moment / mass - c * h) / h;
    out[c] = th > 0 && th < 1 ? th : 0.5;
  }
  return out;
}

// ------------------------------------------------------------------ cache

const CACHE_SIZE = 64;
const cache = new Map<string, RenewalTable>();

/**
 * The tables of an engine under a rule with step h reaching at least `hours`,
 * from the cache when they are there (a longer table serves a shorter need:
 * the recursions are causal, so a prefix is the same numbers).
 */
export function renewalTable(e: RenewalEngine, rule: RenewalRule, h: number, hours: number): RenewalTable {
  const key = `${rule}|${e.weibullShape}|${e.weibullScaleHours}|${e.lifeHours}|${e.serviceIntervalHours}|${h}`;
  // rounded up to a multiple of 256 cells, so the trucks of a case (each a little longer) share one table
  const cells = Math.ceil((Math.ceil(hours / h) + 2) / 256) * 256;
  const found = cache.get(key);
  if (found && found.n >= cells) return found;
  const table = buildRenewalTable(e, rule, h, cells);
  if (cache.size >= CACHE_SIZE) cache.delete(cache.keys().next().value as string);
  cache.set(key, table);
  return table;
}
