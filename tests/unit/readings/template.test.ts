/**
 * The readings import template: header only, exactly the import's columns;
 * the XLSX's "Columns" sheet explains each with an example, and the examples
 * filled into the template make a row the import accepts.
 */
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { readTable } from '@/lib/import/read-table';
import { planReadingsImport, READING_COLUMNS } from '@/lib/readings/import-plan';
import { readingExamples, readingsTemplateCsv, readingsTemplateXlsx } from '@/lib/readings/template';

const HEADER = READING_COLUMNS.map((c) => c.name);
const TODAY = new Date('2026-06-15T12:00:00Z');
const lookups = { trucks: new Map([['T7-02', 7]]), engines: new Map([['km-new', 3]]), saved: [] };

describe('readings import template', () => {
  it('the CSV is the header line only, the import columns in order', async () => {
    const csv = readingsTemplateCsv();
    expect(csv).toBe(`${HEADER.join(',')}\r\n`);
    const table = await readTable('readings-template.csv', new TextEncoder().encode(csv));
    expect(table.header).toEqual(HEADER);
    expect(table.rows).toEqual([]);
    // the import takes the header and asks for rows
    expect(planReadingsImport(table, lookups, 'refuse', TODAY).problems).toEqual([{ row: 2, column: '(file)', message: 'The file has a header but no data rows.' }]);
  });

  it('the XLSX has a header-only "Readings" sheet and a "Columns" sheet with each column, whether required, what it holds and an example', async () => {
    const bytes = await readingsTemplateXlsx({ unit: 'T7-02', engine: 'km-new', engines: ['km-new', 'old-eng'] });
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(bytes.buffer.slice(bytes.byteOffset, bytes.byteOffset + bytes.byteLength) as ArrayBuffer);
    expect(wb.worksheets.map((w) => w.name)).toEqual(['Readings', 'Columns']);
    const sheet = wb.getWorksheet('Readings')!;
    expect(sheet.rowCount).toBe(1);
    expect((sheet.getRow(1).values as unknown[]).slice(1)).toEqual(HEADER);

    const help = wb.getWorksheet('Columns')!;
    expect((help.getRow(1).values as unknown[]).slice(1)).toEqual(['column', 'required', 'what it holds', 'example']);
    const rows = READING_COLUMNS.map((_, i) => (help.getRow(i + 2).values as unknown[]).slice(1));
    expect(rows.map((r) => r[0])).toEqual(HEADER);
    expect(rows.map((r) => r[1])).toEqual(READING_COLUMNS.map((c) => (c.required ? 'yes' : 'no')));
    expect(rows.map((r) => r[2])).toEqual(READING_COLUMNS.map((c) => c.help));
    expect(rows.find((r) => r[0] === 'unit_number')![3]).toBe('T7-02');
    expect(rows.find((r) => r[0] === 'repower_engine_type')![3]).toBe('km-new');
    expect(rows.find((r) => r[0] === 'month')![3]).toBe('2026-04');
    for (const r of rows) expect(String(r[3] ?? '')).not.toBe('');
    const lines = help.getSheetValues().map((v) => (Array.isArray(v) ? v.slice(1).join(' ') : ''));
    expect(lines.some((l) => l.includes('engine type keys in this workspace km-new, old-eng'))).toBe(true);

    // the first sheet read as the import reads it: the header and no rows
    const table = await readTable('readings-template.xlsx', bytes);
    expect(table.header).toEqual(HEADER);
    expect(table.rows).toEqual([]);

    // filled in with the examples, the template imports
    const examples = rows.map((r) => String(r[3]));
    sheet.addRow(examples);
    const filled = await readTable('filled.xlsx', new Uint8Array(await wb.xlsx.writeBuffer()));
    const plan = planReadingsImport(filled, lookups, 'refuse', TODAY);
    expect(plan.problems).toEqual([]);
    expect(plan.rows[0]).toMatchObject({ unitNumber: 'T7-02', truckId: 7, action: 'create' });
    expect(plan.rows[0].input).toMatchObject({ month: '2026-04', hourMeter: 18950, fuelLitres: 148500, daysDown: 3, repowerDate: '2026-04-17', repowerCost: 1540000, repowerEngineTypeId: 3 });
  });

  it('without a workspace to name, the examples are generic', () => {
    const ex = readingExamples();
    expect(ex.unit_number).toBe('T-101');
    expect(Object.keys(ex)).toEqual(HEADER);
  });
});
