/**
 * The Summary table as CSV (RFC 4180: comma-separated, CRLF, quotes doubled).
 * Text that begins with = + - @ (or a tab or carriage return) is prefixed with
 * an apostrophe so a spreadsheet opening the file shows it as text instead of
 * running it; numbers are written as plain numbers (a negative NPV stays a number).
 */
import type { CaseResult } from '@/lib/engine/types';
import { summaryHeaders } from './sheet-summary';

export type CsvCell = string | number | null;

/** A text cell made inert and quoted when it needs to be. */
export function csvText(text: string): string {
  const inert = /^[=+\-@\t\r]/.test(text) ? `'${text}` : text;
  return /[",\r\n']/.test(inert) ? `"${inert.replace(/"/g, '""')}"` : inert;
}

export function csvCell(v: CsvCell): string {
  if (v === null) return '';
  if (typeof v === 'number') return Number.isFinite(v) ? String(v) : '';
  return csvText(v);
}

export function toCsv(rows: CsvCell[][]): string {
  return rows.map((r) => r.map(csvCell).join(',')).join('\r\n') + '\r\n';
}

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
  return toCsv(summaryRows(result, currency));
}
