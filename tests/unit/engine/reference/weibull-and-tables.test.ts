/**
 * The reference's own building blocks, each against a published or closed
 * form value: the Weibull mean life η·Γ(1 + 1/β), the sampler's laws
 * (MODEL.md section 11), the MACRS table (IRS Publication 946, Table A-1)
 * and the declining-balance rule of MODEL.md section 6.
 */
import { describe, expect, it } from 'vitest';
import { gamma } from 'mathjs';
import type { Engine } from '@/lib/validation/case';
import {
  mulberry32,
  weibullAgeFromUniform,
  weibullMeanLife,
} from '@/tests/support/reference-expectation';
import { REF_MACRS_PERCENT, refDepreciationSchedule, refMedianAge } from '@/tests/support/reference-path';

describe('weibullMeanLife = η·Γ(1 + 1/β)', () => {
  it('shape 1 (exponential): Γ(2) = 1, so the mean is η', () => {
    expect(weibullMeanLife(1, 24000)).toBeCloseTo(24000, 6);
  });
  it('shape 2 (Rayleigh): Γ(1.5) = √π/2, so the mean is η·√π/2', () => {
    expect(weibullMeanLife(2, 10000)).toBeCloseTo((10000 * Math.sqrt(Math.PI)) / 2, 6);
  });
  it('shape 4: Γ(1.25) = 0.9064024771 (Abramowitz & Stegun, Table 6.1)', () => {
    expect(weibullMeanLife(4, 1)).toBeCloseTo(0.9064024771, 9);
  });
  it('Γ(1.5) = 0.8862269255 (Abramowitz & Stegun, Table 6.1; = √π/2)', () => {
    expect(gamma(1.5) as number).toBeCloseTo(0.8862269255, 9);
  });
  it('Γ(1.1) = 0.9513507699 and Γ(1.9) = 0.9617658319 (A&S Table 6.1 values, from memory)', () => {
    expect(gamma(1.1) as number).toBeCloseTo(0.9513507699, 9);
    expect(gamma(1.9) as number).toBeCloseTo(0.9617658319, 9);
  });
});

describe('the sampler draws the laws of MODEL.md section 11', () => {
  const engine = { weibullShape: 3.2, weibullScaleHours: 24000 } as Engine;
  it('fresh lives: the sample mean is η·Γ(1 + 1/β) within 4 standard errors', () => {
    const u = mulberry32(2024);
    const n = 200_000;
    let sum = 0;
    let sumSq = 0;
    for (let i = 0; i < n; i++) {
      const x = weibullAgeFromUniform(engine, 0, u());
      sum += x;
      sumSq += x * x;
    }
    const mean = sum / n;
    const se = Math.sqrt((sumSq / n - mean * mean) / n);
    expect(Math.abs(mean - weibullMeanLife(3.2, 24000))).toBeLessThan(4 * se);
  });
  it('the engine fitted today (a0 = 16,500 h): every draw exceeds a0, and half fall below the conditional median of MODEL.md §3', () => {
    const u = mulberry32(7);
    const n = 100_000;
    const median = refMedianAge(engine, 16500);
    let below = 0;
    let min = Infinity;
    for (let i = 0; i < n; i++) {
      const x = weibullAgeFromUniform(engine, 16500, u());
      min = Math.min(min, x);
      if (x < median) below++;
    }
    expect(min).toBeGreaterThan(16500);
    // binomial(n, 1/2): standard deviation √n/2 ≈ 158
    expect(Math.abs(below - n / 2)).toBeLessThan(4 * Math.sqrt(n) / 2);
  });
  it('conditional survival: P(X > a0 + s | X > a0) = R(a0 + s)/R(a0) (MODEL.md §11)', () => {
    const u = mulberry32(11);
    const n = 100_000;
    const a0 = 16500;
    const s = 4000;
    const R = (x: number) => Math.exp(-Math.pow(x / 24000, 3.2));
    let survive = 0;
    for (let i = 0; i < n; i++) if (weibullAgeFromUniform(engine, a0, u()) > a0 + s) survive++;
    const p = R(a0 + s) / R(a0);
    expect(Math.abs(survive / n - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / n));
  });
});

describe('depreciation tables of the reference (MODEL.md §6)', () => {
  it('MACRS half-year percentages (IRS Publication 946, Table A-1): n + 1 entries, each column sums to 100', () => {
    for (const [years, column] of Object.entries(REF_MACRS_PERCENT)) {
      expect(column.length).toBe(Number(years) + 1);
      expect(column.reduce((a, b) => a + b, 0)).toBeCloseTo(100, 6);
    }
  });
  it('MACRS 7-year: 14.29, 24.49, 17.49, 12.49, 8.93, 8.92, 8.93, 4.46 % (IRS Publication 946, Table A-1, from memory)', () => {
    expect(refDepreciationSchedule(10000, { method: 'macrs', years: 7 })).toEqual(
      [1429, 2449, 1749, 1249, 893, 892, 893, 446].map((x) => expect.closeTo(x, 9)),
    );
  });
  it('double-declining balance, 5 years, 1,000: 400, 240, 144, 108, 108 (switch to straight line in year 4; the textbook DDB example)', () => {
    expect(refDepreciationSchedule(1000, { method: 'declining-balance', years: 5, factor: 2 })).toEqual(
      [400, 240, 144, 108, 108].map((x) => expect.closeTo(x, 9)),
    );
  });
  it('straight line, 5 years: a fifth a year', () => {
    expect(refDepreciationSchedule(1000, { method: 'straight-line', years: 5 })).toEqual([200, 200, 200, 200, 200]);
  });
});
