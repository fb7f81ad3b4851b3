import { describe, expect, it } from 'vitest';
import { cleanFileName } from '@/lib/storage/file-types';
import { submitSchema } from '@/lib/validation/approval';
import { caseNameSchema } from '@/lib/validation/business-case';
import { stripControlCharacters } from '@/lib/validation/control-characters';
import { truckInputSchema } from '@/lib/validation/fleet';

const BIDI = ['\u202A', '\u202B', '\u202C', '\u202D', '\u202E', '\u2066', '\u2067', '\u2068', '\u2069', '\u200E', '\u200F', '\u061C'];

describe('control and bidirectional characters in stored text', () => {
  it('are stripped: every bidi embedding, override, isolate and mark, C0/C1 controls, other format characters', () => {
    for (const c of BIDI) expect(stripControlCharacters(`quote${c}fdp.exe`)).toBe('quotefdp.exe');
    expect(stripControlCharacters('a\u0000b\u0007c\u001bd\u007fe\u0085f\u009fg')).toBe('abcdefg');
    expect(stripControlCharacters('zero\u200Bwidth\uFEFF\u00ADsoft\u2060joiner\u2028line\u2029para')).toBe('zerowidthsoftjoinerlinepara');
    expect(stripControlCharacters('tab\tline\nfeed\r')).toBe('tablinefeed');
    expect(stripControlCharacters('tab\tline\nfeed\r', { keepLineBreaks: true })).toBe('tab\tline\nfeed\r');
  });

  it('leaves ordinary text alone, the zero-width joiners that scripts and emoji need included', () => {
    for (const s of ['Kestrel quote 2026.pdf', 'Überlader Nr. 7 — 50 %', 'مرحبا', 'می\u200Cخواهم', '👩\u200D🔧', 'T3-01']) expect(stripControlCharacters(s)).toBe(s);
  });

  it('never reach a stored file name', () => {
    expect(cleanFileName('quote\u202Efdp.exe')).toBe('quotefdp.exe');
    expect(cleanFileName('C:\\Users\\x\\\u2067quote\u2069 "2026".pdf')).toBe('quote 2026.pdf');
    expect(cleanFileName('\u202E\u200F')).toBe('document');
  });

  it('are stripped by the text schemas of the register, case names and approval comments before the formula rule', () => {
    expect(caseNameSchema.parse(' North\u202E pit ')).toBe('North pit');
    expect(submitSchema.parse({ comment: 'Looks\u2066 right.\nSecond line' }).comment).toBe('Looks right.\nSecond line');
    const notes = truckInputSchema.shape.notes;
    expect(notes.parse('Cab\u202E refit\nin 2027')).toBe('Cab refit\nin 2027');
    // a control character in front of "=" does not hide the formula from the rule
    expect(notes.safeParse('\u200E=HYPERLINK("x")').success).toBe(false);
  });
});
