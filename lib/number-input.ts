/**
 * The one rule for numbers typed into forms and read from imported files
 * (pure; used in the browser and on the server).
 *
 * A workspace writes numbers one of two ways (`numberFormat` in its display
 * settings): "point" — 18,950.5 (decimal point, comma groups; the default) —
 * or "comma" — 18.950,5 (decimal comma, point groups). In both, a space
 * (also a no-break or thin space) may group thousands: 18 950,5.
 *
 * Accepted: an optional sign (+, - or the minus sign −), digits, thousands
 * grouped in threes with the workspace's grouping mark or spaces (never
 * mixed), and at most one decimal mark followed by digits. Refused, each with
 * a plain reason: anything else (letters, two decimal marks, groups not of
 * three), an exponent (1e5: written in full instead, so a typo such as "1e5"
 * for "15" never saves 100,000), and a number outside the field's range.
 *
 * @example
 * parseNumberText('18,950', 'point')  // → { ok: true, value: 18950 }
 * parseNumberText('8,50', 'point')    // → { ok: false, message: 'enter a number such as 8.5 (this workspace writes decimals with a point)' }
 * parseNumberText('18.950,5', 'comma') // → { ok: true, value: 18950.5 }
 */

export const NUMBER_FORMATS = ['point', 'comma'] as const;
export type NumberFormat = (typeof NUMBER_FORMATS)[number];

const MARKS: Record<NumberFormat, { decimal: string; group: string; word: string }> = {
  point: { decimal: '.', group: ',', word: 'a point' },
  comma: { decimal: ',', group: '.', word: 'a comma' },
};

/** The example given in messages: "18,950" or "18.950". */
export const numberExample = (format: NumberFormat) => `18${MARKS[format].group}950`;

export type ParsedNumber = { ok: true; value: number | null } | { ok: false; message: string };

export type NumberRange = {
  min?: number;
  max?: number;
  integer?: boolean;
  /** the example in messages, in the workspace's format (a form gives the field's own value); default 18,950 or 18.950 */
  example?: string;
};

const SPACES = /[\u0020\u00a0\u2007\u2009\u202f]/;

/** A number written in the workspace's format, for messages and for a form's first value (no grouping). */
export function formatNumberText(value: number, format: NumberFormat, group = false): string {
  const text = group ? value.toLocaleString('en-US', { maximumFractionDigits: 10 }) : plainDigits(value);
  if (format === 'point') return text;
  return text.replace(/[.,]/g, (m) => (m === '.' ? ',' : '.'));
}

/** A finite number without an exponent: 1e21 → "1000000000000000000000", 1e-7 → "0.0000001". */
function plainDigits(value: number): string {
  const s = String(value);
  if (!/e/i.test(s)) return s;
  return value.toLocaleString('en-US', { useGrouping: false, maximumFractionDigits: 20 });
}

const rangeText = (x: number, format: NumberFormat) => formatNumberText(x, format, true);

/**
 * Reads `text` as a number in `format`. Empty (or only spaces) is `null`: the
 * caller decides whether the field may be empty. Messages are lower-case
 * reasons to put after the field's label: "Engine hours: enter a number such as 18,950".
 */
export function parseNumberText(text: string, format: NumberFormat, range: NumberRange = {}): ParsedNumber {
  const { decimal, group, word } = MARKS[format];
  const example = range.example ?? numberExample(format);
  const s = text.trim();
  if (s === '') return { ok: true, value: null };
  if (s.length > 100) return { ok: false, message: `enter a number such as ${example}` };
  if (/^[-+−]?[\d.,\s]*\d[eE][-+]?\d+$/.test(s)) return { ok: false, message: 'write the number in full, without an exponent (e)' };

  const m = /^([-+−]?)(.*)$/.exec(s) as RegExpExecArray;
  const negative = m[1] === '-' || m[1] === '−';
  const body = m[2];
  const parts = body.split(decimal);
  if (parts.length > 2) return { ok: false, message: `enter a number such as ${example}; it has more than one decimal mark (${decimal})` };
  const [whole, fraction] = parts;
  if (fraction !== undefined && !/^\d+$/.test(fraction)) return { ok: false, message: `enter a number such as ${example}` };
  const spaced = SPACES.test(whole);
  const hasGroup = whole.includes(group);
  let digits: string;
  if (whole === '') {
    if (fraction === undefined) return { ok: false, message: `enter a number such as ${example}` };
    digits = '0';
  } else if (/^\d+$/.test(whole)) {
    digits = whole;
  } else if (spaced && hasGroup) {
    return { ok: false, message: `enter a number such as ${example}; group thousands with "${group}" or with spaces, not both` };
  } else {
    const groups = whole.split(spaced ? SPACES : group);
    if (!/^\d{1,3}$/.test(groups[0]) || groups.slice(1).some((g) => !/^\d{3}$/.test(g))) {
      // "8,50" where the decimal mark is a point: most likely a decimal comma
      const otherDecimal = group;
      if (fraction === undefined && new RegExp(`^\\d+\\${otherDecimal}\\d{1,2}$|^\\d+\\${otherDecimal}\\d{4,}$`).test(whole)) {
        const guess = whole.replace(otherDecimal, decimal);
        return { ok: false, message: `enter a number such as ${guess.replace(/0+$/, '').replace(/\.$|,$/, '')} (this workspace writes decimals with ${word})` };
      }
      return { ok: false, message: `enter a number such as ${example}` };
    }
    digits = groups.join('');
  }
  const value = Number(`${negative ? '-' : ''}${digits}${fraction !== undefined ? `.${fraction}` : ''}`);
  if (!Number.isFinite(value)) return { ok: false, message: `enter a number such as ${example}` };
  const clean = value === 0 ? 0 : value; // no "-0"
  if (range.integer && !Number.isInteger(clean)) return { ok: false, message: 'enter a whole number' };
  const { min, max } = range;
  if (min !== undefined && max !== undefined && (clean < min || clean > max)) return { ok: false, message: `enter a number from ${rangeText(min, format)} to ${rangeText(max, format)}` };
  if (min !== undefined && clean < min) return { ok: false, message: `enter a number of at least ${rangeText(min, format)}` };
  if (max !== undefined && clean > max) return { ok: false, message: `enter a number of at most ${rangeText(max, format)}` };
  return { ok: true, value: clean };
}
