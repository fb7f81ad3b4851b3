/**
 * The Summary table as CSV, through the one CSV writer (lib/csv.ts: RFC 4180,
 * formula-looking text made inert, numbers left as numbers).
 *
 * Money is rounded to the cent (half away from zero) and its headers say so;
 * the engine's floating-point sums would otherwise show as 1985681.2499999998.
 * Rates and years stay at full precision, also said in their headers. The
 * workbook keeps full precision with number formats; only this text file rounds.
 */
import { toCsv } from '@/lib/csv';
import type { CaseResult } from '@/lib/engine/types';
import { summaryHeaders } from './sheet-summary';

export type CsvCell = string | number | null;

const na = (v: number | null): CsvCell => (v === null ? 'n/a' : v);

/** Money to the cent, half away from zero; -0 becomes 0. */
export function toCents(v: number): number {
  if (!Number.isFinite(v)) return v;
  const r = (Math.sign(v) * Math.round(Math.abs(v) * 100)) / 100;
  return r === 0 ? 0 : r;
}

/** Columns of summaryHeaders holding money (rounded here) and rates or years (full precision). */
const MONEY_COLUMNS = new Set([2, 3, 4, 6, 7, 8, 13]);
const FULL_PRECISION_COLUMNS = new Set([9, 10, 11, 12]);

/** The Summary headers with the CSV's precision stated: "NPV keep (USD, rounded to cents)". */
export function csvSummaryHeaders(currency: string): string[] {
  return summaryHeaders(currency).map((h, i) => {
    if (MONEY_COLUMNS.has(i)) return h.replace(`(${currency})`, `(${currency}, rounded to cents)`);
    if (FULL_PRECISION_COLUMNS.has(i)) return h.endsWith(')') ? `${h.slice(0, -1)}, full precision)` : `${h} (full precision)`;
    return h;
  });
}

const roundRow = (row: CsvCell[]): CsvCell[] => row.map((c, i) => (MONEY_COLUMNS.has(i) && typeof c === 'number' ? toCents(c) : c));

/** The Summary sheet's rows with the engine's values, and the fleet line. */
export function summaryRows(result: CaseResult, currency: string): CsvCell[][] {
  const rows: CsvCell[][] = [csvSummaryHeaders(currency)];
  let d1 = 0;
  let d2 = 0;
  for (const t of result.trucks) {
    const capital = -t.options.repower.breakdown.reduce((s, b) => s + b.capital, 0);
    d1 += t.repowerVsRebuild.deltaNpv;
    d2 += t.repowerVsKeep.deltaNpv;
    rows.push(roundRow([
      t.id, t.horizonYears, t.options.keep.npv, t.options.rebuild.npv, t.options.repower.npv, t.best, t.options[t.best].npv,
      t.repowerVsRebuild.deltaNpv, t.repowerVsKeep.deltaNpv, na(t.repowerVsRebuild.irr), na(t.repowerVsRebuild.mirr),
      na(t.repowerVsRebuild.paybackYears), na(t.repowerVsRebuild.discountedPaybackYears), capital,
    ]));
  }
  const f = result.fleet;
  rows.push(roundRow(['Fleet', null, f.npv.keep, f.npv.rebuild, f.npv.repower, null, f.npv.best, d1, d2, null, null, null, null, f.capital.repower]));
  return rows;
}

export function summaryCsv(result: CaseResult, currency: string): string {
  const [header, ...rows] = summaryRows(result, currency);
  return toCsv(header, rows);
}
