/**
 * Issue 12, security probe: a CSV saved in Latin-1 (Windows-1252) imported
 * silently, its accented letters replaced by U+FFFD. Invalid UTF-8 is now
 * refused with the offset and line of the first bad byte; rows and columns are
 * capped while the file is parsed, record by record.
 */
import { describe, expect, it } from 'vitest';
import { FileProblem, firstInvalidUtf8, readTable } from '@/lib/import/read-table';

const HEADER = 'unit_number,payload_class,notes';
const utf8 = (s: string) => new TextEncoder().encode(s);
const latin1 = (s: string) => Uint8Array.from(Buffer.from(s, 'latin1'));

describe('issue 12: CSV encoding and size limits', () => {
  it('refuses a Latin-1 file, naming the first bad byte and its line and suggesting "CSV UTF-8"', async () => {
    const bytes = latin1(`${HEADER}\r\nT1,300 t,ok\r\nT2,300 t,Révision faite\r\n`);
    await expect(readTable('fleet.csv', bytes)).rejects.toThrow(FileProblem);
    await expect(readTable('fleet.csv', bytes)).rejects.toThrow(
      'The file is not UTF-8 text (the byte at offset 56, on line 3, is 0xE9). It was probably saved as plain "CSV", in an older encoding such as Windows-1252 or Latin-1, so accented letters would be imported wrong. Save it again as "CSV UTF-8 (Comma delimited)" and import that file.',
    );
  });

  it('accepts UTF-8 with and without a byte-order mark, accents and all', async () => {
    const text = `${HEADER}\r\nT2,300 t,Révision faite – 東京 😀\r\n`;
    for (const bytes of [utf8(text), utf8(`\ufeff${text}`)]) {
      const t = await readTable('fleet.csv', bytes);
      expect(t.header).toEqual(['unit_number', 'payload_class', 'notes']);
      expect(t.rows).toEqual([{ row: 2, cells: ['T2', '300 t', 'Révision faite – 東京 😀'] }]);
    }
  });

  it('finds the first byte that is not well-formed UTF-8', () => {
    const at = (...b: number[]) => firstInvalidUtf8(Uint8Array.from(b));
    expect(at(0x41, 0xc3, 0xa9, 0x42)).toBe(-1); // é
    expect(at(0xe2, 0x80, 0x93)).toBe(-1); // –
    expect(at(0xf0, 0x9f, 0x98, 0x80)).toBe(-1); // 😀
    expect(at(0x41, 0xe9, 0x42)).toBe(1); // Latin-1 é
    expect(at(0xc0, 0xaf)).toBe(0); // overlong "/"
    expect(at(0xe0, 0x80, 0xaf)).toBe(0); // overlong
    expect(at(0xed, 0xa0, 0x80)).toBe(0); // a surrogate
    expect(at(0xf4, 0x90, 0x80, 0x80)).toBe(0); // above U+10FFFF
    expect(at(0x41, 0xe2, 0x80)).toBe(1); // cut short at the end
    expect(at(0x80)).toBe(0); // a lone continuation byte
  });

  it('refuses a row of more than 100 columns, naming the row; trailing empty cells do not count', async () => {
    const wide = `${HEADER}\nT1,300 t,ok\n${Array.from({ length: 150 }, (_, i) => `v${i}`).join(',')}\n`;
    await expect(readTable('fleet.csv', utf8(wide))).rejects.toThrow('Row 3 has 150 columns; the limit is 100. The fleet sheet has 11 columns: remove the others.');
    const padded = `${HEADER}${','.repeat(200)}\nT1,300 t,ok${','.repeat(200)}\n`;
    expect((await readTable('fleet.csv', utf8(padded))).rows).toHaveLength(1);
    const header = `${Array.from({ length: 101 }, (_, i) => `c${i}`).join(',')}\nT1\n`;
    await expect(readTable('fleet.csv', utf8(header))).rejects.toThrow(/^Row 1 has 101 columns; the limit is 100\./);
  });

  it('refuses more than 10,000 data rows with the count, the limit and the first row past it, keeping blank lines out of the count', async () => {
    const lines = [HEADER, ...Array.from({ length: 10_001 }, (_, i) => `U${i},300 t,x`)];
    lines.splice(5, 0, '', ',,'); // blank records: skipped, but they keep the file's row numbers
    await expect(readTable('fleet.csv', utf8(lines.join('\n')))).rejects.toThrow(
      'The file has 10,001 data rows; the limit is 10,000 (row 10,004 is the first past it). Split it into smaller files.',
    );
    const ok = await readTable('fleet.csv', utf8(lines.slice(0, -1).join('\n')));
    expect(ok.rows).toHaveLength(10_000);
    expect(ok.rows[4]).toEqual({ row: 8, cells: ['U4', '300 t', 'x'] });
  }, 120_000);

  it('keeps memory bounded on 5 MB of blank lines', async () => {
    const bytes = utf8(`${HEADER}\n${'\n'.repeat(5 * 1024 * 1024 - HEADER.length - 2)}`);
    const start = process.memoryUsage.rss();
    const t = await readTable('fleet.csv', bytes);
    const growth = process.memoryUsage.rss() - start;
    console.log(`5 MB of blank lines: resident set grew ${(growth / 1048576).toFixed(0)} MB`);
    expect(t.rows).toEqual([]);
    expect(growth).toBeLessThan(300 * 1024 * 1024);
  }, 120_000);
});
