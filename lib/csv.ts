/**
 * The one CSV writer (audit log, Summary table): RFC 4180, comma-separated,
 * CRLF line ends, quotes doubled.
 *
 * A text cell that a spreadsheet would read as a formula (starting with
 * = + - @, or a tab or carriage return that some programs skip first) gets a
 * leading apostrophe, so a value typed into Haulcase can never run as a
 * formula in whoever opens the download. Numbers are written as plain
 * numbers (a negative NPV stays a number); a non-finite number, null or
 * undefined is an empty cell. Cells with a comma, quote or line break are
 * quoted.
 */
export function csvCell(value: unknown): string {
  if (value == null) return '';
  if (typeof value === 'number') return Number.isFinite(value) ? String(value) : '';
  let s = String(value);
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const csvLine = (cells: readonly unknown[]): string => cells.map(csvCell).join(',');

/** A whole CSV document: the header line, then the rows. */
export const toCsv = (header: readonly unknown[], rows: readonly (readonly unknown[])[]): string =>
  [csvLine(header), ...rows.map(csvLine)].join('\r\n') + '\r\n';
