import { readFileSync } from 'node:fs';
import path from 'node:path';
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { evaluateCase } from '@/lib/engine';
import { summaryCsv } from '@/lib/export/csv';
import type { CaseFileInput } from '@/lib/validation/case';

describe('CSV of the Summary table', () => {
  // the cells themselves: tests/unit/mail/parse-csv-diff.test.ts (the one CSV writer)
  it('has one row per truck with the engine figures and a fleet line', () => {
    const demo = JSON.parse(readFileSync(path.resolve(__dirname, '../../scenarios/aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
    demo.trucks[0] = { ...demo.trucks[0], id: '=1+2' };
    const result = evaluateCase(demo);
    const parsed = Papa.parse<string[]>(summaryCsv(result, 'USD').trim(), { skipEmptyLines: true }).data;
    expect(parsed).toHaveLength(1 + demo.trucks.length + 1);
    expect(parsed[0][2]).toBe('NPV keep (USD)');
    expect(parsed[1][0]).toBe("'=1+2");
    expect(Number(parsed[1][2])).toBe(result.trucks[0].options.keep.npv);
    expect(parsed[1][5]).toBe(result.trucks[0].best);
    expect(parsed.at(-1)?.[0]).toBe('Fleet');
    expect(Number(parsed.at(-1)?.[6])).toBe(result.fleet.npv.best);
  });
});
