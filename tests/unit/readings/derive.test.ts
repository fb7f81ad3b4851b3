import { describe, expect, it } from 'vitest';
import { deriveFigures, meterProblem, monthMinus, monthsBetween, type ReadingForDerivation } from '@/lib/readings/derive';

const r = (month: string, hourMeter: number, fuelLitres: number, over: Partial<ReadingForDerivation> = {}): ReadingForDerivation => ({
  month, hourMeter, fuelLitres, overhauls: 0, repowerDate: null, repowerEngineTypeId: null, ...over,
});

// The worked example of lib/readings/derive.ts, worked by hand.
const example = [
  r('2026-02', 10_950, 90_000, { overhauls: 1 }),
  r('2025-12', 10_000, 250_000),
  r('2026-03', 11_500, 110_000),
  r('2026-01', 10_500, 100_000),
];

describe('deriveFigures', () => {
  it('matches the worked example (window of 3 months)', () => {
    const d = deriveFigures(example, 3)!;
    expect(d.asOf).toBe('2026-03');
    expect(d.window).toEqual({ from: '2026-01', to: '2026-03', months: 3, askedMonths: 3, readings: 3 });
    // H = 500 + 450 + 550 = 1,500 h
    expect(d.operatingHours).toBe(1500);
    // A = 1,500 × 12 / 3 = 6,000 h a year
    expect(d.annualHours).toBe(6000);
    // B = (100,000 + 90,000 + 110,000) / 1,500 = 200 L/h
    expect(d.litres).toBe(300_000);
    expect(d.fuelBurnLitresPerHour).toBe(200);
    // 11,500 − 10,500 = 1,000 h since the overhaul of 2026-02
    expect(d.engineHours).toEqual({ value: 1000, basis: 'since-overhaul', since: '2026-02' });
    expect(d.repower).toBeNull();
  });

  it('a window of 1 month uses only the latest month', () => {
    const d = deriveFigures(example, 1)!;
    // baseline 2026-02 (10,950 h): 550 h in 1 month, 110,000 L
    expect(d.operatingHours).toBe(550);
    expect(d.annualHours).toBe(6600);
    expect(d.fuelBurnLitresPerHour).toBe(200);
  });

  it('a window longer than the readings starts at the first reading and says so', () => {
    const d = deriveFigures(example, 12)!;
    expect(d.window).toEqual({ from: '2026-01', to: '2026-03', months: 3, askedMonths: 12, readings: 3 });
  });

  it('a gap counts as months: two readings four months apart', () => {
    const d = deriveFigures([r('2025-01', 1000, 0), r('2025-05', 3000, 400_000)], 12)!;
    // 2,000 h over 4 months → 6,000 h a year; 400,000 L / 2,000 h = 200 L/h
    expect(d.window!.months).toBe(4);
    expect(d.annualHours).toBe(6000);
    expect(d.fuelBurnLitresPerHour).toBe(200);
  });

  it('a repower month counts the new meter from zero and gives the engine fitted', () => {
    const d = deriveFigures([r('2025-01', 20_000, 0), r('2025-02', 20_400, 80_000), r('2025-03', 300, 60_000, { repowerDate: '2025-03-10', repowerEngineTypeId: 7 })], 2)!;
    // 400 h + 300 h (new meter) = 700 h; 140,000 L / 700 h = 200 L/h; 700 × 12 / 2 = 4,200 h a year
    expect(d.operatingHours).toBe(700);
    expect(d.fuelBurnLitresPerHour).toBe(200);
    expect(d.annualHours).toBe(4200);
    expect(d.engineHours).toEqual({ value: 300, basis: 'since-repower', since: '2025-03' });
    expect(d.repower).toEqual({ month: '2025-03', date: '2025-03-10', engineTypeId: 7 });
  });

  it('without an overhaul or repower the engine hours are the meter (since new)', () => {
    const d = deriveFigures([r('2025-01', 12_345, 0)], 12)!;
    expect(d.engineHours).toEqual({ value: 12_345, basis: 'meter', since: null });
    expect(d.window).toBeNull();
    expect(d.annualHours).toBeNull();
    expect(d.fuelBurnLitresPerHour).toBeNull();
  });

  it('no hours run: no burn (never a division by zero)', () => {
    const d = deriveFigures([r('2025-01', 100, 0), r('2025-02', 100, 0)], 12)!;
    expect(d.operatingHours).toBe(0);
    expect(d.fuelBurnLitresPerHour).toBeNull();
  });

  it('no readings: null; a window below 1 month is refused', () => {
    expect(deriveFigures([], 12)).toBeNull();
    expect(() => deriveFigures(example, 0)).toThrow(RangeError);
  });
});

describe('months', () => {
  it('counts and steps across years', () => {
    expect(monthsBetween('2025-11', '2026-02')).toBe(3);
    expect(monthMinus('2026-02', 3)).toBe('2025-11');
    expect(monthMinus('2026-01', 12)).toBe('2025-01');
    expect(monthMinus('2025-12', -1)).toBe('2026-01');
  });
});

describe('meterProblem', () => {
  it('refuses a fall, except in a repower month', () => {
    expect(meterProblem({ month: '2025-01', hourMeter: 1000 }, { hourMeter: 999, repowerDate: null })).toMatch(/lower than the reading of 2025-01/);
    expect(meterProblem({ month: '2025-01', hourMeter: 1000 }, { hourMeter: 1000, repowerDate: null })).toBeNull();
    expect(meterProblem({ month: '2025-01', hourMeter: 1000 }, { hourMeter: 5, repowerDate: '2025-02-03' })).toBeNull();
    expect(meterProblem(null, { hourMeter: 5, repowerDate: null })).toBeNull();
  });
});

describe('docs/methodology.md "Input limits"', () => {
  it('lists every number of a reading', async () => {
    const { readFileSync } = await import('node:fs');
    const { readingFieldsSchema } = await import('@/lib/validation/readings');
    const doc = readFileSync('docs/methodology.md', 'utf8');
    const section = doc.slice(doc.indexOf('## Input limits'), doc.indexOf('\n## ', doc.indexOf('## Input limits') + 3));
    const fields = Object.keys(readingFieldsSchema.shape).filter((k) => !['notes', 'repowerEngineTypeId'].includes(k));
    expect(fields.length).toBe(9);
    for (const f of [...fields, 'windowMonths']) expect(section, f).toContain(`\`${f}\``);
  });
});
