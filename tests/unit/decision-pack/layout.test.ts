import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { fiscalYearLabel, moneyK, packDisposition, niceTicks, pdfText, tableBreaks } from '@/lib/decision-pack/layout';
import { HEADER_HEIGHT, PAGE, renderDecisionPack, ROW_HEIGHT } from '@/lib/decision-pack/render';
import { packFixture } from '@/tests/support/decision-pack-fixture';
import { firstPageInkShare, pdfPageCount, pdfToText } from '@/tests/support/pdf-text';

const fonts = { regular: readFileSync('app/fonts/ibm-plex-sans-latin-400-normal.woff'), bold: readFileSync('app/fonts/ibm-plex-sans-latin-600-normal.woff') };

describe('decision pack text and figures', () => {
  it('keeps the minus sign with IBM Plex and writes a hyphen with Helvetica (WinAnsi has no U+2212)', () => {
    expect(pdfText('−1,250', 'plex')).toBe('−1,250');
    expect(pdfText('−1,250', 'helvetica')).toBe('-1,250');
    expect(pdfText('ΔNPV ≥ 0, CO₂', 'plex')).toBe('Delta NPV >= 0, CO2');
    // a character the font's own glyph test refuses becomes "?"
    expect(pdfText('a✓b', 'plex', (cp) => cp !== 0x2713)).toBe('a?b');
  });

  it('formats money in thousands as the pages do, in either negative style', () => {
    expect(moneyK(-1_234_567, 'minus')).toBe('−1,235');
    expect(moneyK(-1_234_567, 'parentheses')).toBe('(1,235)');
    expect(moneyK(34_600_000, 'minus')).toBe('34,600');
    expect(moneyK(null, 'minus')).toBe('—');
    expect(fiscalYearLabel('FY2027')).toBe('FY2027');
    expect(fiscalYearLabel(null)).toBe('—');
  });

  it('names the download "<case name> decision pack.pdf", with an ASCII stand-in for old clients', () => {
    expect(packDisposition('North Pit — "2027"')).toBe(
      `attachment; filename="North Pit _ _2027_ decision pack.pdf"; filename*=UTF-8''North%20Pit%20%E2%80%94%20%222027%22%20decision%20pack.pdf`,
    );
    expect(packDisposition("Bob's (rev. 2)")).toContain("filename*=UTF-8''Bob%27s%20%28rev.%202%29%20decision%20pack.pdf");
  });

  it('chooses round chart ticks that include zero and cover the values', () => {
    // span 3,500 over 5 steps = 700 a step, rounded up to the next of 1, 2, 2.5, 5 × 10^k: 1,000
    expect(niceTicks(-2400, 1100, 5)).toEqual([-3000, -2000, -1000, 0, 1000, 2000]);
    expect(niceTicks(0, 0)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(niceTicks(3, 9, 3)).toEqual([0, 5, 10]);
  });
});

describe('page breaks of a table', () => {
  const page = { top: 56, bottom: 777.89, rowHeight: 14, headerHeight: 18 };
  it('breaks where the rows stop fitting and every full page after that', () => {
    // first page: ⌊(777.89 − 600 − 18) / 14⌋ = 11 rows; a full page: ⌊(777.89 − 56 − 18) / 14⌋ = 50 rows
    expect(tableBreaks(100, { ...page, startY: 600 })).toEqual([11, 61]);
    expect(tableBreaks(11, { ...page, startY: 600 })).toEqual([]);
    expect(tableBreaks(12, { ...page, startY: 600 })).toEqual([11]);
  });
  it('starts on a new page when not even the header and one row fit', () => {
    expect(tableBreaks(60, { ...page, startY: 760 })).toEqual([0, 50]);
    expect(tableBreaks(0, { ...page, startY: 760 })).toEqual([]);
  });

  it('the renderer repeats the ranking header on every page the ranking runs onto and never splits a row', async () => {
    const pdf = await renderDecisionPack(packFixture({ trucks: 120 }), fonts);
    const pages = pdfToText(pdf).split('\f').filter((p) => p.trim());
    const withRanking = pages.filter((p) => /HT-\d{3}\s+(yes\s+)?(repower|rebuild)/.test(p));
    expect(withRanking.length).toBeGreaterThanOrEqual(3);
    for (const p of withRanking) expect(p).toMatch(/Rank\s+Truck\s+In proposal\s+Policy/);
    // every truck row is printed once, whole
    const rows = pages.join('\n').match(/^\s*\d+\s+HT-\d{3}\s+(yes\s+)?(repower|rebuild)\s+\S+\s+\S+\s+1,200\s+FY20\d\d$/gm) ?? [];
    expect(rows).toHaveLength(120);
    // the rows a full page holds, from the page size the renderer uses
    const perPage = Math.floor((PAGE.height - PAGE.bottom - PAGE.top - HEADER_HEIGHT) / ROW_HEIGHT);
    expect(withRanking.slice(1, -1).every((p) => (p.match(/HT-\d{3}\s+(yes\s+)?(repower|rebuild)/g) ?? []).length === perPage)).toBe(true);
  });

  it('prints plan against actual when the approved case has readings after its approval, the flagged truck with its variance', async () => {
    const text = pdfToText(await renderDecisionPack(packFixture({ trucks: 4, approved: true, actuals: true }), fonts));
    expect(text).toContain('Plan against actual');
    expect(text).toContain('Readings 2027-01 to 2027-12');
    expect(text).toMatch(/HT-001\s+repower\s+−2.0 %\s+\+8.0 %\s+300\s+520\s+burn/);
    expect(text).toMatch(/Saving against rebuilding \(AUD k\)\s+1,100\s+1,400/);
    expect(text).toMatch(/Operating hours \(h\)\s+70,000\s+72,000\s+−2.8 %/);
    const without = pdfToText(await renderDecisionPack(packFixture({ trucks: 4, approved: true }), fonts));
    expect(without).not.toContain('Plan against actual');
  });

  it('draws a page that is not blank, with the footer "page n of m" on each page', async () => {
    const pdf = await renderDecisionPack(packFixture({ trucks: 8, approved: true }), fonts);
    const n = pdfPageCount(pdf);
    const text = pdfToText(pdf);
    for (let i = 1; i <= n; i++) expect(text).toContain(`Page ${i} of ${n}`);
    expect(firstPageInkShare(pdf)).toBeGreaterThan(0.01);
    expect(text).toContain('−150'); // the minus sign survives embedding
    expect(text).toContain('a'.repeat(64));
    // the pinned run's provenance and figures
    expect(text).toMatch(/Monte Carlo run\s+3f2a9c0e/);
    expect(text).toMatch(/Seed\s+42/);
    expect(text).toMatch(/Run by\s+Ana Analyst/);
    expect(text).toMatch(/Chance of losing money\s+8\.7 %/);
    expect(text).toMatch(/P10 \(AUD k\)\s+−120/);
    // a truck left out: its capital, the gain it forgoes and the extra budget that would add it
    expect(text).toMatch(/HT-008\s+1,100\s+90\s+1,000\s+over the FY2027 budget/);
    expect(text).toMatch(/manufacturer’s\s+procedures/);
  });

  it('falls back to Helvetica without the font files, with hyphens for minus signs', async () => {
    const text = pdfToText(await renderDecisionPack(packFixture(), null));
    expect(text).toMatch(/Gain vs the unconstrained best\s+-150/);
    expect(text).not.toContain('−');
    expect(text).toContain('No pinned run: submitted without a pinned Monte Carlo run.');
  });
});
