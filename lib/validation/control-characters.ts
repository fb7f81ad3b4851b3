/**
 * Unicode control (Cc) and format (Cf) characters, and the line and paragraph
 * separators: invisible, and the bidirectional ones (U+202A–U+202E embeddings
 * and overrides, U+2066–U+2069 isolates, U+200E/U+200F and U+061C marks)
 * reorder what is shown, so "quote\u202Efdp.exe" reads as "quoteexe.pdf".
 * The zero-width joiners U+200C/U+200D stay: Persian and Indic scripts and
 * emoji need them, and they reorder nothing.
 */
const CONTROL = /[\p{Cc}\p{Cf}\u2028\u2029]/gu;
const KEEP = new Set(['\u200c', '\u200d']);
const LINE_BREAKS = new Set(['\t', '\n', '\r']);

/**
 * The text without control and format characters. `keepLineBreaks` keeps tab,
 * line feed and carriage return, for multi-line text such as notes and comments.
 * Applied to every stored free-text field through the shared text schemas, and
 * to stored file names.
 */
export function stripControlCharacters(s: string, o: { keepLineBreaks?: boolean } = {}): string {
  return s.replace(CONTROL, (c) => (KEEP.has(c) || (o.keepLineBreaks && LINE_BREAKS.has(c)) ? c : ''));
}

/** For zod's `.overwrite()` on multi-line free text. */
export const stripControlKeepingLines = (s: string) => stripControlCharacters(s, { keepLineBreaks: true });
