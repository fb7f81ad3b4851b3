/**
 * The Summary table as CSV, through the one CSV writer (lib/csv.ts: RFC 4180,
 * formula-looking text made inert, numbers left as numbers).
 */
import { toCsv } from '@/lib/csv';
import type { CaseResult } from '@/lib/engine/types';
import { summaryHeaders } from './sheet-summary';

export type CsvCell = string | number | null;

const na = (v: number | null): CsvCell => (v === null ? 'n/a' : v);

/** The Summary sheet's rows with the engine's values, and the fleet line. */
export function summaryRows(result: CaseResult, currency: string): CsvCell[][] {
  const rows: CsvCell[][] = [summaryHeaders(currency)];
  let d1 = 0;
  let d2 = 0;
  for (const t of result.trucks) {
    const capital = -t.options.repower.breakdown.reduce((s, b) => s + b.capital, 0);
    d1 += t.repowerVsRebuild.deltaNpv;
    d2 += t.repowerVsKeep.deltaNpv;
    rows.push([
      t.id, t.horizonYears, t.options.keep.npv, t.options.rebuild.npv, t.options.repower.npv, t.best, t.options[t.best].npv,
      t.repowerVsRebuild.deltaNpv, t.repowerVsKeep.deltaNpv, na(t.repowerVsRebuild.irr), na(t.repowerVsRebuild.mirr),
      na(t.repowerVsRebuild.paybackYears), na(t.repowerVsRebuild.discountedPaybackYears), capital,
    ]);
  }
  const f = result.fleet;
  rows.push(['Fleet', null, f.npv.keep, f.npv.rebuild, f.npv.repower, null, f.npv.best, d1, d2, null, null, null, null, f.capital.repower]);
  return rows;
}

export function summaryCsv(result: CaseResult, currency: string): string {
  const [header, ...rows] = summaryRows(result, currency);
  return toCsv(header, rows);
}
