/**
 * Summaries of Monte Carlo samples: moments, percentiles, the chance of a
 * loss, a histogram and the running mean (to show convergence).
 */
import { bestPolicy } from '../../results';
import { POLICY_SLOTS } from '../iterations';

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

/** Summary of samples in iteration order (the order matters for the running mean only). */
export function summarise(samples: Float64Array, bins = 30): Summary {
  const n = samples.length;
  let sum = 0;
  const runningMean: [number, number][] = [];
  const step = Math.max(1, Math.ceil(n / 100));
  for (let i = 0; i < n; i++) {
    sum += samples[i];
    if ((i + 1) % step === 0 || i === n - 1) runningMean.push([i + 1, sum / (i + 1)]);
  }
  const mean = n ? sum / n : Number.NaN;
  let ss = 0;
  let negative = 0;
  for (let i = 0; i < n; i++) {
    ss += (samples[i] - mean) ** 2;
    if (samples[i] < 0) negative++;
  }
  const sorted = Float64Array.from(samples).sort();
  const min = sorted[0];
  const max = sorted[n - 1];
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
    p5: percentileSorted(sorted, 0.05),
    p10: percentileSorted(sorted, 0.1),
    p50: percentileSorted(sorted, 0.5),
    p90: percentileSorted(sorted, 0.9),
    p95: percentileSorted(sorted, 0.95),
    probNegative: n ? negative / n : Number.NaN,
    histogram,
    runningMean,
  };
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
  };
}

/** Summaries from the npvs of `runIterations` (concatenated in iteration order). */
export function summariseRun(truckIds: readonly string[], npvs: Float64Array): MonteCarloResult {
  const trucks = truckIds.length;
  const iterations = Math.floor(npvs.length / (trucks * POLICY_SLOTS));
  const fleetDelta = new Float64Array(iterations);
  const fleetBest = new Float64Array(iterations);
  const perTruck = truckIds.map(() => new Float64Array(iterations));
  const best = truckIds.map(() => ({ keep: 0, rebuild: 0, repower: 0 }));
  for (let i = 0; i < iterations; i++) {
    for (let t = 0; t < trucks; t++) {
      const o = (i * trucks + t) * POLICY_SLOTS;
      const keep = npvs[o];
      const rebuild = npvs[o + 1];
      const repower = npvs[o + 2];
      const d = repower - rebuild;
      perTruck[t][i] = d;
      fleetDelta[i] += d;
      const b = bestPolicy({ keep, rebuild, repower });
      best[t][b]++;
      fleetBest[i] += b === 'keep' ? keep : b === 'rebuild' ? rebuild : repower;
    }
  }
  const share = (c: { keep: number; rebuild: number; repower: number }) => ({
    keep: c.keep / iterations,
    rebuild: c.rebuild / iterations,
    repower: c.repower / iterations,
  });
  return {
    iterations,
    trucks: truckIds.map((id, t) => ({ id, deltaNpv: summarise(perTruck[t], 20), bestShare: share(best[t]) })),
    fleet: { deltaNpv: summarise(fleetDelta), bestNpv: summarise(fleetBest) },
  };
}
