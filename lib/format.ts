/**
 * Display formatting. The engine computes in floating point; rounding happens here only.
 * Negative money is shown in parentheses when the workspace asks for it (finance convention).
 */
export type NegativeStyle = 'parentheses' | 'minus';

const cache = new Map<string, Intl.NumberFormat>();
function nf(min: number, max: number): Intl.NumberFormat {
  const key = `${min}:${max}`;
  let f = cache.get(key);
  if (!f) {
    f = new Intl.NumberFormat('en-US', { minimumFractionDigits: min, maximumFractionDigits: max, useGrouping: true });
    cache.set(key, f);
  }
  return f;
}

/** A number with thousands separators; '—' for null or non-finite. */
export function formatNumber(x: number | null | undefined, digits = 0, negative: NegativeStyle = 'minus'): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const rounded = Number(x.toFixed(digits));
  const body = nf(digits, digits).format(Math.abs(rounded));
  if (rounded < 0) return negative === 'parentheses' ? `(${body})` : `−${body}`;
  return body;
}

/** Money in a currency's units, or thousands with `scale: 'k'` (the header carries the unit). */
export function formatMoney(x: number | null | undefined, opts: { negative?: NegativeStyle; scale?: 'unit' | 'k' | 'M'; digits?: number } = {}): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  const div = opts.scale === 'k' ? 1e3 : opts.scale === 'M' ? 1e6 : 1;
  const digits = opts.digits ?? (opts.scale === 'M' ? 2 : 0);
  return formatNumber(x / div, digits, opts.negative ?? 'parentheses');
}

/** A rate as a percentage: 0.0866 → "8.66 %". */
export function formatPercent(x: number | null | undefined, digits = 1): string {
  if (x === null || x === undefined || !Number.isFinite(x)) return '—';
  return `${formatNumber(x * 100, digits)} %`;
}

/** Years with one decimal, e.g. payback. */
export const formatYears = (x: number | null | undefined) => (x === null || x === undefined ? '—' : formatNumber(x, 1));

/**
 * The colour class of a signed figure, read on the figure as shown: only a value that shows as negative
 * takes the negative style ('text-loss'), only one that shows as positive 'text-gain'; a figure that
 * rounds to 0 (0, −0.2 shown in k as "0") is neutral. `shownIn` is the figure's display unit and digits.
 */
export function signTone(x: number | null | undefined, shownIn: { scale?: 'unit' | 'k' | 'M'; digits?: number } = {}): '' | 'text-gain' | 'text-loss' {
  if (x === null || x === undefined || !Number.isFinite(x)) return '';
  const div = shownIn.scale === 'k' ? 1e3 : shownIn.scale === 'M' ? 1e6 : 1;
  const digits = shownIn.digits ?? (shownIn.scale === 'M' ? 2 : 0);
  const rounded = Number((x / div).toFixed(digits));
  return rounded > 0 ? 'text-gain' : rounded < 0 ? 'text-loss' : '';
}
