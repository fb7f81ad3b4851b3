/**
 * One CSV cell. A cell that a spreadsheet would read as a formula (starting
 * with = + - @, or a tab or carriage return that some programs skip first) gets
 * a leading apostrophe, so a value typed into Haulcase can never run as a
 * formula in whoever opens the download. Cells with a comma, quote or line
 * break are quoted, quotes doubled (RFC 4180).
 */
export function csvCell(value: unknown): string {
  let s = value == null ? '' : String(value);
  if (/^[=+\-@\t\r]/.test(s)) s = `'${s}`;
  return /[",\r\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

export const csvLine = (cells: unknown[]): string => cells.map(csvCell).join(',');

/** A whole CSV document with CRLF line ends, as spreadsheet programs expect. */
export const toCsv = (header: string[], rows: unknown[][]): string => [csvLine(header), ...rows.map(csvLine)].join('\r\n') + '\r\n';
