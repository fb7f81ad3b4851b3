/**
 * The one rule for a numeric id in a URL (a path segment or a query value):
 * 1 to 999,999,999 written plainly, so no sign, leading zero, exponent, hex
 * prefix, space or decimal point ("0x10", "1e3", "01", " 1" and "1.0" are not
 * ids), and never more than the 32-bit integer columns hold. lib/http.ts builds
 * `idParam` on it; query-string schemas (audit's `user`) use it directly.
 */
export const ID_PATTERN = /^[1-9]\d{0,8}$/;

export const isIdText = (raw: string): boolean => ID_PATTERN.test(raw);
