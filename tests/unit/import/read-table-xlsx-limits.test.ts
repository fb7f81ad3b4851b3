/**
 * Issue 12, security probe: a 4.3 MB workbook sent to the fleet import grew the
 * server from 0.3 to 6.8 GB, because the whole workbook was unpacked and
 * loaded before the row limit was checked. Now the archive's table of contents
 * is judged first, the parts read are inflated once with their output counted
 * (never kept), and the sheet is streamed and stopped at the first row past
 * the limit. Memory is measured as the growth of this process's resident set
 * while the file is read (no timings).
 */
import ExcelJS from 'exceljs';
import { beforeAll, describe, expect, it } from 'vitest';
import { IMPORT_LIMITS } from '@/lib/import/columns';
import { FileProblem, readTable } from '@/lib/import/read-table';
import { deflateStreaming, sharedStringsXml, sheetXml, stylesXml, workbookParts, writeZip } from '../../support/zip-writer';

const MB = 1024 * 1024;
const BOUND = 300 * MB;
/** Building and reading archives of tens of MB on a busy machine: a generous ceiling, not a timing. */
const SLOW = 120_000;

/** Reads the file, sampling the resident set as it goes; the peak growth over the start and what was thrown. */
async function readMeasured(name: string, bytes: Uint8Array) {
  const start = process.memoryUsage.rss();
  let peak = start;
  const sample = () => (peak = Math.max(peak, process.memoryUsage.rss()));
  const timer = setInterval(sample, 2);
  let error: unknown;
  try {
    await readTable(name, bytes);
  } catch (e) {
    error = e;
  } finally {
    sample();
    clearInterval(timer);
  }
  const growth = peak - start;
  console.log(`${name}: ${(bytes.length / MB).toFixed(2)} MB file, resident set grew ${(growth / MB).toFixed(0)} MB`);
  return { error, growth };
}

async function workbook(rows: Array<Array<ExcelJS.CellValue>>, more?: (wb: ExcelJS.Workbook) => void): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Fleet');
  for (const r of rows) ws.addRow(r);
  more?.(wb);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe('issue 12: an XLSX zip bomb is refused with bounded memory', () => {
  let honestHuge: Uint8Array; // declares its real, huge size
  let lying: Uint8Array; // declares 1 MB, inflates to over 80 MB
  let manyRows: Uint8Array; // within every size limit, 300,000 rows
  let sheetSize = 0;

  beforeAll(async () => {
    const big = await deflateStreaming(sheetXml(300_000, 1, 200)); // each row with 200 spaces of text
    sheetSize = big.size;
    honestHuge = writeZip([...workbookParts(), { name: 'xl/worksheets/sheet1.xml', deflated: big.deflated, declaredSize: big.size, crc: big.crc }]);
    lying = writeZip([...workbookParts(), { name: 'xl/worksheets/sheet1.xml', deflated: big.deflated, declaredSize: 1 * MB, crc: big.crc }]);
    const rows = await deflateStreaming(sheetXml(300_000));
    expect(rows.size).toBeLessThan(IMPORT_LIMITS.xlsxMaxEntryBytes);
    expect(rows.size / rows.deflated.length).toBeLessThan(IMPORT_LIMITS.xlsxMaxRatio);
    expect(rows.deflated.length).toBeLessThan(IMPORT_LIMITS.maxBytes);
    manyRows = writeZip([...workbookParts(), { name: 'xl/worksheets/sheet1.xml', deflated: rows.deflated, declaredSize: rows.size, crc: rows.crc }]);
  }, SLOW);

  it('refuses a sheet part that declares more than 50 MB, before unpacking it', async () => {
    expect(sheetSize).toBeGreaterThan(80 * MB);
    expect(honestHuge.length).toBeLessThan(IMPORT_LIMITS.maxBytes);
    const { error, growth } = await readMeasured('declared-huge.xlsx', honestHuge);
    expect(error).toBeInstanceOf(FileProblem);
    expect((error as Error).message).toMatch(/The workbook part "xl\/worksheets\/sheet1\.xml" unpacks to \d\d\.\d MB; the limit is 50 MB per part/);
    expect(growth).toBeLessThan(BOUND);
  });

  it('refuses a sheet part that declares 1 MB but inflates to far more, counting what inflates and keeping none of it', async () => {
    const { error, growth } = await readMeasured('lying-sizes.xlsx', lying);
    expect(error).toBeInstanceOf(FileProblem);
    expect((error as Error).message).toMatch(/"xl\/worksheets\/sheet1\.xml" unpacks to more than the 1,048,576 bytes its header declares/);
    expect(growth).toBeLessThan(BOUND);
  });

  it('stops a sheet of 300,000 rows at the first row past 10,000, naming the limit and the row', async () => {
    const { error, growth } = await readMeasured('many-rows.xlsx', manyRows);
    expect(error).toBeInstanceOf(FileProblem);
    expect((error as Error).message).toBe(
      'The sheet has more than 10,000 data rows (row 10,002 is data row 10,001); the limit is 10,000. Split it into smaller files.',
    );
    expect(growth).toBeLessThan(BOUND);
  }, SLOW);

  it('refuses a part that unpacks over 200 times its packed size, a total over 100 MB and more than 200 parts', async () => {
    const zeros = await deflateStreaming(Array.from({ length: 20 }, () => ' '.repeat(MB)));
    const ratio = writeZip([...workbookParts(), { name: 'xl/sharedStrings.xml', deflated: zeros.deflated, declaredSize: zeros.size }]);
    await expect(readTable('ratio.xlsx', ratio)).rejects.toThrow(/"xl\/sharedStrings\.xml" unpacks [\d,]+ times larger than it is stored; the limit is 200 times/);

    const fake = Buffer.alloc(400 * 1024); // the declared sizes are judged before anything is inflated
    const total = writeZip([
      ...workbookParts(),
      ...[1, 2, 3].map((i) => ({ name: `xl/worksheets/sheet${i}.xml`, deflated: fake, declaredSize: 40 * MB })),
    ]);
    await expect(readTable('total.xlsx', total)).rejects.toThrow('The workbook unpacks to 120 MB; the limit is 100 MB. Save only the fleet sheet as a new workbook.');

    const parts = writeZip([...workbookParts(), ...Array.from({ length: 200 }, (_, i) => ({ name: `xl/media/image${i}.png`, text: 'x' }))]);
    await expect(readTable('parts.xlsx', parts)).rejects.toThrow('The workbook holds 204 files; the limit is 200. Save only the fleet sheet as a new workbook.');
  }, SLOW);

  it('reads the largest parts the limits let through (40 MB of shared strings, 9 MB of styles) with bounded memory', async () => {
    const strings = await deflateStreaming(sharedStringsXml(2_400_000, 200));
    const styles = await deflateStreaming(stylesXml(150_000));
    const sheet = await deflateStreaming(sheetXml(10_000, 11));
    expect(strings.size).toBeGreaterThan(40 * MB);
    expect(strings.size / strings.deflated.length).toBeLessThan(IMPORT_LIMITS.xlsxMaxRatio);
    expect(styles.size).toBeGreaterThan(9 * MB);
    expect(styles.size).toBeLessThan(IMPORT_LIMITS.xlsxMaxStylesBytes);
    const part = (name: string, d: { deflated: Buffer; size: number; crc: number }) => ({ name, deflated: d.deflated, declaredSize: d.size, crc: d.crc });
    const bytes = writeZip([...workbookParts(), part('xl/sharedStrings.xml', strings), part('xl/styles.xml', styles), part('xl/worksheets/sheet1.xml', sheet)]);
    const start = process.memoryUsage.rss();
    let peak = start;
    const timer = setInterval(() => (peak = Math.max(peak, process.memoryUsage.rss())), 2);
    const table = await readTable('largest.xlsx', bytes).finally(() => clearInterval(timer));
    peak = Math.max(peak, process.memoryUsage.rss());
    console.log(`largest.xlsx: ${(bytes.length / MB).toFixed(2)} MB file, resident set grew ${((peak - start) / MB).toFixed(0)} MB`);
    expect(table.rows).toHaveLength(10_000);
    expect(peak - start).toBeLessThan(BOUND);

    const moreStyles = await deflateStreaming(stylesXml(175_000));
    expect(moreStyles.size).toBeGreaterThan(IMPORT_LIMITS.xlsxMaxStylesBytes);
    const refused = writeZip([...workbookParts(), part('xl/styles.xml', moreStyles), part('xl/worksheets/sheet1.xml', sheet)]);
    await expect(readTable('styles.xlsx', refused)).rejects.toThrow(/^The workbook part "xl\/styles\.xml" unpacks to 1\d\.\d MB; the limit is 10 MB for the styles/);
  }, SLOW);

  it('refuses a row of more than 100 columns, naming the row', async () => {
    const cols = await deflateStreaming(sheetXml(3, 150));
    const wide = writeZip([...workbookParts(), { name: 'xl/worksheets/sheet1.xml', deflated: cols.deflated, declaredSize: cols.size }]);
    await expect(readTable('wide.xlsx', wide)).rejects.toThrow('Row 2 has 150 columns; the limit is 100. The fleet sheet has 11 columns: remove the others.');
    const header = Array.from({ length: 101 }, (_, i) => `c${i}`);
    await expect(readTable('wide-header.xlsx', await workbook([header, ['x']]))).rejects.toThrow(/^Row 1 has 101 columns; the limit is 100\./);
  });

  it('refuses what is not a well-formed archive', async () => {
    const good = await workbook([['unit_number'], ['T1']]);
    const cut = good.slice(0, good.length - 10); // the end record cut off
    await expect(readTable('cut.xlsx', cut)).rejects.toThrow('The file is not a readable XLSX workbook.');
    const noBook = writeZip([{ name: 'xl/worksheets/sheet1.xml', text: '<worksheet/>' }]);
    await expect(readTable('nobook.xlsx', noBook)).rejects.toThrow('The file is not a readable XLSX workbook.');
  });
});

describe('the streamed XLSX reader reads what the full reader read', () => {
  it('takes values from the first sheet only, with the sheet\'s row numbers, skipping blank rows', async () => {
    const bytes = await workbook(
      [
        ['unit_number', 'engine_hours_h', ' notes '],
        ['T1', 9000, 'plain'],
        [],
        ['T2', 1.5, { richText: [{ text: 'ri' }, { text: 'ch' }] }],
        ['T3', true, { formula: 'A1&"x"', result: 'x' }],
        ['T4', new Date(Date.UTC(2024, 0, 2)), { text: 'link', hyperlink: 'http://example.invalid' }],
      ],
      (wb) => wb.addWorksheet('Columns').addRow(['not', 'read']),
    );
    const table = await readTable('fleet.xlsx', bytes);
    expect(table.header).toEqual(['unit_number', 'engine_hours_h', 'notes']);
    expect(table.rows).toEqual([
      { row: 2, cells: ['T1', 9000, 'plain'] },
      { row: 4, cells: ['T2', 1.5, 'rich'] },
      { row: 5, cells: ['T3', 'true', { formula: 'A1&"x"' }] },
      { row: 6, cells: ['T4', '2024-01-02T00:00:00.000Z', 'link'] },
    ]);
  });

  it('reads 10,000 rows of a fleet sheet, and a sheet of numbers only (no shared strings part)', async () => {
    const rows = Array.from({ length: IMPORT_LIMITS.maxRows }, (_, i) => [`T${i}`, 9000 + i, 'note']);
    const table = await readTable('full.xlsx', await workbook([['unit_number', 'engine_hours_h', 'notes'], ...rows]));
    expect(table.rows).toHaveLength(10_000);
    expect(table.rows[9999]).toEqual({ row: 10_001, cells: ['T9999', 18_999, 'note'] });
    const numbers = await deflateStreaming(sheetXml(5));
    const bytes = writeZip([...workbookParts(), { name: 'xl/worksheets/sheet1.xml', deflated: numbers.deflated, declaredSize: numbers.size, crc: numbers.crc }]);
    const t = await readTable('numbers.xlsx', bytes);
    expect(t.header).toEqual(['unit_number']);
    expect(t.rows.map((r) => r.cells)).toEqual([[2], [3], [4], [5], [6]]);
  }, SLOW);

  it('takes the first sheet in the workbook\'s order, whatever its part is called (here sheet2.xml, by an absolute target)', async () => {
    const NS = 'http://schemas.openxmlformats.org/spreadsheetml/2006/main';
    const REL = 'http://schemas.openxmlformats.org/officeDocument/2006/relationships';
    const sheet = (v: string) =>
      `<worksheet xmlns="${NS}"><sheetData><row r="1"><c r="A1" t="inlineStr"><is><t>unit_number</t></is></c></row><row r="2"><c r="A2" t="inlineStr"><is><t>${v}</t></is></c></row></sheetData></worksheet>`;
    const parts = workbookParts().map((p) =>
      p.name === 'xl/workbook.xml'
        ? { name: p.name, text: `<workbook xmlns="${NS}" xmlns:r="${REL}"><sheets><sheet name="Fleet" sheetId="2" r:id="rId2"/><sheet name="Other" sheetId="1" r:id="rId1"/></sheets></workbook>` }
        : p.name === 'xl/_rels/workbook.xml.rels'
          ? {
              name: p.name,
              text: `<Relationships xmlns="http://schemas.openxmlformats.org/package/2006/relationships"><Relationship Id="rId1" Type="${REL}/worksheet" Target="worksheets/sheet1.xml"/><Relationship Id="rId2" Type="${REL}/worksheet" Target="/xl/worksheets/sheet2.xml"/></Relationships>`,
            }
          : p,
    );
    const bytes = writeZip([...parts, { name: 'xl/worksheets/sheet1.xml', text: sheet('second tab') }, { name: 'xl/worksheets/sheet2.xml', text: sheet('first tab') }]);
    expect((await readTable('order.xlsx', bytes)).rows).toEqual([{ row: 2, cells: ['first tab'] }]);
  });

  it('answers "empty" for a workbook with no values', async () => {
    await expect(readTable('empty.xlsx', await workbook([]))).rejects.toThrow('The file is empty.');
  });
});
