/**
 * Assumption sets keep `valuation` and `lostMarginShare` in their own columns
 * (migration 0013) and every other assumption in the `assumptions` JSON text.
 * The columns are the stored truth: a write moves the two keys out of the
 * JSON, a read puts the columns back into the case file's `assumptions`.
 * Plain code (no server-only) so the demo seed can use it.
 */
export const ASSUMPTION_COLUMNS = ['valuation', 'lostMarginShare'] as const;

type Json = Record<string, unknown>;

/** The row values of an assumptions object: the JSON text without the two keys, and the two columns (defaults when absent). */
export function assumptionSetColumns(assumptions: Json): { assumptions: string; valuation: string; lostMarginShare: number } {
  const { valuation, lostMarginShare, ...rest } = assumptions;
  return {
    assumptions: JSON.stringify(rest),
    valuation: typeof valuation === 'string' ? valuation : 'expected',
    lostMarginShare: typeof lostMarginShare === 'number' ? lostMarginShare : 1,
  };
}

/** The case file's `assumptions` object of a stored row: the JSON with the columns' values. */
export function assumptionsOfRow(row: Json): Json {
  const parsed = JSON.parse(String(row.assumptions)) as Json;
  return { ...parsed, valuation: row.valuation ?? 'expected', lostMarginShare: Number(row.lostMarginShare ?? 1) };
}
