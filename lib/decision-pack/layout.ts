/**
 * Pure layout helpers of the decision pack: text the embedded font can show,
 * figures as the pages show them, fiscal-year labels, chart scales and where
 * a long table breaks across pages. No PDF library here (unit-tested alone).
 */
import { formatMoney, formatNumber, formatPercent, type NegativeStyle } from '@/lib/format';

/**
 * Characters the pack's fonts lack, with what to print instead. The embedded
 * IBM Plex Sans (latin subset) has the minus sign (U+2212), the euro and pound
 * signs, dashes and curly quotes, but not Δ, ≥ or subscript digits; the
 * built-in Helvetica fallback (WinAnsi) lacks the minus sign too.
 */
const PLEX_FALLBACK: Record<string, string> = { 'Δ': 'Delta ', '₂': '2', '≥': '>=', '≤': '<=', '→': '->', '₹': 'INR ', '\u00a0': ' ', '\u202f': ' ' };
const HELVETICA_FALLBACK: Record<string, string> = { ...PLEX_FALLBACK, '−': '-', '\u2009': ' ' };

export type PackFont = 'plex' | 'helvetica';

/** `s` with every character the font cannot draw replaced by a readable stand-in (`has`: the font's own glyph test; others become "?"). */
export function pdfText(s: string, font: PackFont = 'plex', has?: (codePoint: number) => boolean): string {
  const table = font === 'plex' ? PLEX_FALLBACK : HELVETICA_FALLBACK;
  let out = '';
  for (const ch of s) {
    const cp = ch.codePointAt(0) as number;
    if (table[ch] !== undefined) out += table[ch];
    else if (has && cp > 0x7e && !has(cp)) out += '?';
    else out += ch;
  }
  return out;
}

/** Money in thousands of the currency, as the case pages show it (negative in parentheses or with a minus sign). */
export const moneyK = (x: number | null | undefined, negative: NegativeStyle) => formatMoney(x, { scale: 'k', negative });

/** Money in millions with one decimal, for the headline ("34.6"). */
export const moneyM = (x: number | null | undefined, negative: NegativeStyle) => formatMoney(x, { scale: 'M', digits: 1, negative });

export const percent = (x: number | null | undefined) => formatPercent(x, 1);

export const years = (x: number | null | undefined) => (x === null || x === undefined ? '—' : `${formatNumber(x, 1)} yr`);

/** A fiscal-year label as the plan tables show it ("FY2027"), or a dash. */
export const fiscalYearLabel = (fy: string | null | undefined) => fy ?? '—';

/** Round axis ticks covering [min, max] (always including 0), about `count` of them. */
export function niceTicks(min: number, max: number, count = 5): number[] {
  let lo = Math.min(0, min);
  let hi = Math.max(0, max);
  if (hi - lo < 1e-9) hi = lo + 1;
  const raw = (hi - lo) / Math.max(1, count);
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 2.5, 5, 10].map((f) => f * mag).find((s) => s >= raw - 1e-12) as number;
  lo = Math.floor(lo / step + 1e-9) * step;
  hi = Math.ceil(hi / step - 1e-9) * step;
  const ticks: number[] = [];
  for (let v = lo; v <= hi + step / 2; v += step) ticks.push(Math.abs(v) < step / 1e6 ? 0 : Number(v.toPrecision(12)));
  return ticks;
}

/**
 * Where a table of `rows` rows of height `rowHeight` breaks when it starts at
 * `startY` on a page whose text area ends at `bottom`; every continued page
 * starts at `top` and repeats the header (`headerHeight`). Returns the index of
 * the first row of each page after the first (empty: it fits). If not even the
 * header and one row fit below `startY`, the table starts on a new page:
 * index 0 is listed.
 */
export function tableBreaks(rows: number, o: { startY: number; top: number; bottom: number; rowHeight: number; headerHeight: number }): number[] {
  const perFullPage = Math.max(1, Math.floor((o.bottom - o.top - o.headerHeight) / o.rowHeight));
  const firstRoom = Math.floor((o.bottom - o.startY - o.headerHeight) / o.rowHeight);
  const breaks: number[] = [];
  let next: number;
  if (rows === 0) return breaks;
  if (firstRoom < 1) {
    breaks.push(0);
    next = perFullPage;
  } else next = firstRoom;
  while (next < rows) {
    breaks.push(next);
    next += perFullPage;
  }
  return breaks;
}

/** At most this many rows of the ranking and of the schedule are printed (the rest are counted in a line: bounded work). */
export const MAX_TABLE_ROWS = 400;

/**
 * `Content-Disposition` of the pack: "<case name> decision pack.pdf", the name
 * as typed in `filename*` (RFC 6266 / 5987, UTF-8) and an ASCII stand-in in
 * `filename` for old clients (quotes, backslashes and non-ASCII become "_").
 */
export function packDisposition(caseName: string): string {
  const name = `${caseName.trim() || 'Case'} decision pack.pdf`;
  const ascii = name.replace(/[^\x20-\x7e]|["\\]/g, '_');
  const encoded = encodeURIComponent(name).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}
