import { readFileSync } from 'node:fs';
import path from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { evaluateCase } from '@/lib/engine';
import { summaryCsv, toCents } from '@/lib/export/csv';
import type { CaseFileInput } from '@/lib/validation/case';

describe('CSV of the Summary table', () => {
  // the cells themselves: tests/unit/mail/parse-csv-diff.test.ts (the one CSV writer)
  const demo = JSON.parse(readFileSync(path.resolve(__dirname, '../../scenarios/aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
  demo.trucks[0] = { ...demo.trucks[0], id: '=1+2' };
  const result = evaluateCase(demo);
  const parsed = Papa.parse<string[]>(summaryCsv(result, 'USD').trim(), { skipEmptyLines: true }).data;

  it('has one row per truck with the engine figures (money to the cent) and a fleet line', () => {
    expect(parsed).toHaveLength(1 + demo.trucks.length + 1);
    expect(parsed[0][2]).toBe('NPV keep (USD, rounded to cents)');
    expect(parsed[1][0]).toBe("'=1+2");
    expect(Number(parsed[1][2])).toBeCloseTo(result.trucks[0].options.keep.npv, 2);
    expect(parsed[1][5]).toBe(result.trucks[0].best);
    expect(parsed.at(-1)?.[0]).toBe('Fleet');
    expect(Number(parsed.at(-1)?.[6])).toBeCloseTo(result.fleet.npv.best, 2);
  });

  it('writes every money cell with at most two decimals and says which columns keep full precision', () => {
    const money = parsed[0].map((h, i) => (h.includes('rounded to cents') ? i : -1)).filter((i) => i >= 0);
    expect(money).toEqual([2, 3, 4, 6, 7, 8, 13]);
    for (const row of parsed.slice(1)) for (const i of money) if (row[i] !== '') expect(row[i]).toMatch(/^-?\d+(\.\d{1,2})?$/);
    expect(parsed[0][9]).toBe('IRR repower vs rebuild (full precision)');
    expect(parsed[0][11]).toBe('Payback repower vs rebuild (years, full precision)');
  });

  it('rounds to the cent half away from zero, without floating-point tails', () => {
    // hand-worked: 1985681.2499999998 is 1985681.25 less one unit in the last place
    expect(toCents(1985681.2499999998)).toBe(1985681.25);
    expect(String(toCents(1985681.2499999998))).toBe('1985681.25');
    expect(toCents(0.125)).toBe(0.13);
    expect(toCents(-0.125)).toBe(-0.13);
    expect(toCents(-0.001)).toBe(0);
    expect(Object.is(toCents(-0.001), -0)).toBe(false);
    expect(toCents(1234.5678)).toBe(1234.57);
  });
});
