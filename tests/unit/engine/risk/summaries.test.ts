/**
 * Summaries put only the order statistics they read in place (selection, not
 * a full sort): at every rank they read, they must hold what a sorted copy
 * holds, with ties, signed zeros and sorted or reversed input; and a run's
 * summary is then what the percentile definition (PERCENTILE.INC on the
 * sorted samples) gives.
 */
import { describe, expect, it } from 'vitest';
import { percentileSorted, selectRanks, summarise } from '@/lib/engine/monte-carlo';

/** Deterministic samples: a small LCG, values on a coarse grid so that ties are common. */
function samples(n: number, seed: number, grid: number): Float64Array {
  let s = seed >>> 0;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    out[i] = Math.round(((s / 2 ** 32) - 0.45) * grid) * 1000;
  }
  return out;
}

describe('selectRanks', () => {
  const cases: [string, Float64Array][] = [
    ['many ties', samples(5000, 1, 40)],
    ['few ties', samples(3001, 2, 1e9)],
    ['signed zeros', Float64Array.from([0, -0, 3, -0, 0, -2, 0, -0, 1, ...samples(200, 3, 4)])],
    ['sorted', Float64Array.from(samples(2000, 4, 1e6)).sort()],
    ['reversed', Float64Array.from(samples(2000, 5, 1e6)).sort().reverse()],
    ['all equal', new Float64Array(1000).fill(7)],
  ];
  for (const [name, data] of cases) {
    it(`puts each asked rank where a sort would (${name})`, () => {
      const sorted = Float64Array.from(data).sort();
      const n = data.length;
      const ranks = [0, n - 1, 1, Math.floor(n / 2), n - 2, Math.floor(n * 0.05), Math.floor(n * 0.95) + 1];
      const a = Float64Array.from(data);
      selectRanks(a, ranks);
      for (const r of ranks) expect(Object.is(a[r], sorted[r]), `rank ${r}`).toBe(true);
      // a permutation of the input
      expect(Array.from(Float64Array.from(a).sort())).toEqual(Array.from(sorted));
    });
  }
});

describe('summarise', () => {
  it('gives min, max and percentiles of the sorted samples (PERCENTILE.INC)', () => {
    const data = samples(9999, 6, 300);
    const sorted = Float64Array.from(data).sort();
    const s = summarise(data);
    expect(s.min).toBe(sorted[0]);
    expect(s.max).toBe(sorted[sorted.length - 1]);
    expect([s.p5, s.p10, s.p50, s.p90, s.p95]).toEqual([0.05, 0.1, 0.5, 0.9, 0.95].map((p) => percentileSorted(sorted, p)));
    expect(s.histogram.reduce((a, b) => a + b.count, 0)).toBe(9999);
  });

  it('leaves the samples in iteration order', () => {
    const data = samples(500, 7, 50);
    const copy = Float64Array.from(data);
    summarise(data);
    expect(Array.from(data)).toEqual(Array.from(copy));
  });
});
