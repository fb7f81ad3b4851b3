/**
 * Summaries of Monte Carlo samples: moments, percentiles, the chance of a
 * loss, a histogram and the running mean (to show convergence).
 */
import { bestPolicyIndex } from '../results';
import type { PolicyKey } from '../types';
import { POLICY_SLOTS } from './iterations';

export interface Summary {
  count: number;
  mean: number;
  /** sample standard deviation (n − 1) */
  sd: number;
  min: number;
  max: number;
  p5: number;
  p10: number;
  p50: number;
  p90: number;
  p95: number;
  /** share of samples below zero (for a Δnpv: the chance the repower loses money) */
  probNegative: number;
  histogram: { from: number; to: number; count: number }[];
  /** [iterations so far, mean so far], at most ~100 points */
  runningMean: [number, number][];
}

/**
 * Percentile p (0..1) of sorted samples by linear interpolation between
 * closest ranks, h = (n − 1)·p (Hyndman & Fan type 7, the spreadsheet PERCENTILE.INC).
 *
 * @example percentileSorted([1, 2, 3, 4], 0.5) // = 2.5
 */
export function percentileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

const PERCENTILES = [0.05, 0.1, 0.5, 0.9, 0.95] as const;

/**
 * Summary of samples in iteration order (the order matters for the running
 * mean only). `scratch`, at least as long as the samples, is used for the
 * ordered copy instead of a new array (many summaries in a row).
 */
export function summarise(samples: Float64Array, bins = 30, scratch?: Float64Array): Summary {
  const n = samples.length;
  let sum = 0;
  let nan = false;
  const runningMean: [number, number][] = [];
  const step = Math.max(1, Math.ceil(n / 100));
  for (let i = 0; i < n; i++) {
    sum += samples[i];
    if (samples[i] !== samples[i]) nan = true;
    if ((i + 1) % step === 0 || i === n - 1) runningMean.push([i + 1, sum / (i + 1)]);
  }
  const mean = n ? sum / n : Number.NaN;
  let ss = 0;
  let negative = 0;
  for (let i = 0; i < n; i++) {
    ss += (samples[i] - mean) ** 2;
    if (samples[i] < 0) negative++;
  }
  // only the order statistics the summary reads (min, max and each percentile's two ranks) are put
  // in place, in O(n) instead of a full sort; they are the numbers a sorted copy holds at those ranks
  const ordered = scratch && scratch.length >= n ? scratch.subarray(0, n) : new Float64Array(n);
  ordered.set(samples);
  if (nan) ordered.sort();
  else {
    const ranks = [0, n - 1];
    for (const p of PERCENTILES) {
      const lo = Math.floor((n - 1) * p);
      ranks.push(lo, Math.min(n - 1, lo + 1));
    }
    selectRanks(ordered, ranks);
  }
  const min = ordered[0];
  const max = ordered[n - 1];
  const histogram: Summary['histogram'] = [];
  const width = (max - min) / bins;
  if (n > 0 && width > 0) {
    for (let b = 0; b < bins; b++) histogram.push({ from: min + b * width, to: b === bins - 1 ? max : min + (b + 1) * width, count: 0 });
    for (let i = 0; i < n; i++) histogram[Math.min(bins - 1, Math.floor((samples[i] - min) / width))].count++;
  } else if (n > 0) {
    histogram.push({ from: min, to: max, count: n });
  }
  return {
    count: n,
    mean,
    sd: n > 1 ? Math.sqrt(ss / (n - 1)) : 0,
    min,
    max,
    p5: percentileSorted(ordered, 0.05),
    p10: percentileSorted(ordered, 0.1),
    p50: percentileSorted(ordered, 0.5),
    p90: percentileSorted(ordered, 0.9),
    p95: percentileSorted(ordered, 0.95),
    probNegative: n ? negative / n : Number.NaN,
    histogram,
    runningMean,
  };
}

/** The order of a typed array's sort: by value, −0 before +0 (no NaN here). */
function before(a: number, b: number): boolean {
  return a < b || (a === 0 && b === 0 && 1 / a < 1 / b);
}

/**
 * Rearrange `a` so that, at each index in `ranks`, it holds what `a.sort()`
 * would put there (multi-quickselect with three-way partitions; a range that
 * partitions badly for long is sorted instead).
 */
export function selectRanks(a: Float64Array, ranks: readonly number[]): void {
  const wanted = [...new Set(ranks)].filter((r) => r >= 0 && r < a.length).sort((x, y) => x - y);
  const stack: number[] = [0, a.length - 1, 0, wanted.length - 1, 0];
  while (stack.length) {
    const depth = stack.pop() as number;
    const rHi = stack.pop() as number;
    const rLo = stack.pop() as number;
    const hi = stack.pop() as number;
    const lo = stack.pop() as number;
    if (rLo > rHi || lo >= hi) continue;
    if (hi - lo < 24 || depth > 60) {
      a.subarray(lo, hi + 1).sort();
      continue;
    }
    const x = a[lo];
    const y = a[(lo + hi) >>> 1];
    const z = a[hi];
    const pivot = before(x, y) ? (before(y, z) ? y : before(x, z) ? z : x) : before(x, z) ? x : before(y, z) ? z : y;
    // [lo, lt) before the pivot, [lt, i) equal to it, (gt, hi] after it
    let lt = lo;
    let gt = hi;
    let i = lo;
    // `before` written out: this loop runs over every sample, often before the optimiser has reached it
    while (i <= gt) {
      const v = a[i];
      if (v < pivot || (v === 0 && pivot === 0 && 1 / v < 1 / pivot)) {
        a[i++] = a[lt];
        a[lt++] = v;
      } else if (pivot < v || (v === 0 && pivot === 0 && 1 / pivot < 1 / v)) {
        a[i] = a[gt];
        a[gt--] = v;
      } else i++;
    }
    let k = rLo;
    while (k <= rHi && wanted[k] < lt) k++;
    stack.push(lo, lt - 1, rLo, k - 1, depth + 1);
    let m = k;
    while (m <= rHi && wanted[m] <= gt) m++;
    stack.push(gt + 1, hi, m, rHi, depth + 1);
  }
}

export interface TruckRisk {
  id: string;
  /** Δnpv of repower against rebuild */
  deltaNpv: Summary;
  /** share of iterations in which each policy is the best */
  bestShare: { keep: number; rebuild: number; repower: number };
}

export interface MonteCarloResult {
  iterations: number;
  trucks: TruckRisk[];
  fleet: {
    /** Σ over trucks of Δnpv repower vs rebuild: the whole repower programme */
    deltaNpv: Summary;
    /** each truck on its best policy in that iteration */
    bestNpv: Summary;
    /**
     * Σ over trucks of npv(the proposal's policy) − npv(rebuild), the policies held
     * fixed (spec.proposal); absent when the run was given no proposal
     */
    proposalNpv?: Summary;
  };
}

/** Summaries from the npvs of `runIterations` (concatenated in iteration order); with a proposal, its figure too. */
export function summariseRun(truckIds: readonly string[], npvs: Float64Array, proposal?: Readonly<Record<string, PolicyKey>> | null): MonteCarloResult {
  const iterations = runLength(truckIds.length, npvs);
  return {
    iterations,
    trucks: summariseTrucks(truckIds, npvs, 0, truckIds.length),
    fleet: summariseFleet(truckIds.length, npvs, proposal ? proposalSlots(truckIds, proposal) : null),
  };
}

/**
 * A proposal's policy of each truck as its npv slot (keep 0, rebuild 1,
 * repower 2), in truck order; a truck the proposal does not name is rebuilt.
 *
 * @example proposalSlots(['A', 'B', 'C'], { A: 'repower', B: 'keep' }) // = [2, 0, 1]
 */
export function proposalSlots(truckIds: readonly string[], policies: Readonly<Record<string, PolicyKey>>): Int8Array {
  const slots = new Int8Array(truckIds.length);
  truckIds.forEach((id, t) => (slots[t] = policies[id] === 'keep' ? 0 : policies[id] === 'repower' ? 2 : 1));
  return slots;
}

/** Whole iterations held in `npvs` for a fleet of `trucks`. */
export function runLength(trucks: number, npvs: ArrayLike<number>): number {
  return Math.floor(npvs.length / (trucks * POLICY_SLOTS));
}


/**
 * The risk of trucks [from, to) of a run: each truck's figures depend on its
 * own samples only, so workers may summarise blocks of trucks side by side.
 */
export function summariseTrucks(truckIds: readonly string[], npvs: Float64Array, from: number, to: number): TruckRisk[] {
  const trucks = truckIds.length;
  const iterations = runLength(trucks, npvs);
  const count = Math.max(0, to - from);
  // one pass in memory order over the run, then each truck's samples on their own
  // one block for every truck's samples, and one buffer for their ordered copies
  const block = new Float64Array(count * iterations);
  const deltas = Array.from({ length: count }, (_, k) => block.subarray(k * iterations, (k + 1) * iterations));
  const scratch = new Float64Array(iterations);
  const best = new Float64Array(count * POLICY_SLOTS);
  for (let i = 0; i < iterations; i++) {
    for (let k = 0; k < count; k++) {
      const o = (i * trucks + from + k) * POLICY_SLOTS;
      deltas[k][i] = npvs[o + 2] - npvs[o + 1];
      best[k * POLICY_SLOTS + bestPolicyIndex(npvs[o], npvs[o + 1], npvs[o + 2])]++;
    }
  }
  return deltas.map((delta, k) => ({
    id: truckIds[from + k],
    deltaNpv: summarise(delta, 20, scratch),
    bestShare: {
      keep: best[k * POLICY_SLOTS] / iterations,
      rebuild: best[k * POLICY_SLOTS + 1] / iterations,
      repower: best[k * POLICY_SLOTS + 2] / iterations,
    },
  }));
}

/**
 * The fleet's figures: per iteration, Σ over trucks (in truck order) of Δnpv
 * and of the best policy's npv; with `proposal` (a slot per truck, from
 * `proposalSlots`), also Σ npv(the truck's slot) − npv(rebuild), the policies
 * held fixed in every iteration.
 */
export function summariseFleet(trucks: number, npvs: Float64Array, proposal?: ArrayLike<number> | null): MonteCarloResult['fleet'] {
  const iterations = runLength(trucks, npvs);
  const fleetDelta = new Float64Array(iterations);
  const fleetBest = new Float64Array(iterations);
  const fleetProposal = proposal ? new Float64Array(iterations) : null;
  for (let i = 0; i < iterations; i++) {
    let d = 0;
    let b = 0;
    let p = 0;
    for (let t = 0; t < trucks; t++) {
      const o = (i * trucks + t) * POLICY_SLOTS;
      const keep = npvs[o];
      const rebuild = npvs[o + 1];
      const repower = npvs[o + 2];
      d += repower - rebuild;
      const k = bestPolicyIndex(keep, rebuild, repower);
      b += k === 0 ? keep : k === 1 ? rebuild : repower;
      if (proposal) p += npvs[o + proposal[t]] - rebuild;
    }
    fleetDelta[i] = d;
    fleetBest[i] = b;
    if (fleetProposal) fleetProposal[i] = p;
  }
  const out: MonteCarloResult['fleet'] = { deltaNpv: summarise(fleetDelta), bestNpv: summarise(fleetBest) };
  if (fleetProposal) out.proposalNpv = summarise(fleetProposal);
  return out;
}
