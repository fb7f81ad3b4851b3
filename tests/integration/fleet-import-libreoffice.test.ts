/**
 * The streamed XLSX reader (issue 12) on a workbook saved by another program:
 * LibreOffice Calc writes its archive with data descriptors (sizes after the
 * data, flag bit 3) and its parts in its own order. Needs `soffice`.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { readTable } from '@/lib/import/read-table';
import { readZipDirectory } from '@/lib/import/zip-directory';
import { makeProfile, recalculate } from '../support/libreoffice';

describe('fleet import of a workbook LibreOffice saved', () => {
  it('reads the first sheet as exceljs wrote it: text, numbers, a date as ISO text, a formula marked, blank rows skipped', async () => {
    const wb = new ExcelJS.Workbook();
    const fleet = wb.addWorksheet('Fleet');
    fleet.addRow(['unit_number', 'engine_hours_h', 'notes']);
    fleet.addRow(['T1', 9000, 'Révision – ok']);
    fleet.addRow([]);
    fleet.addRow(['T3', 1.5, { formula: 'A1&"x"', result: 'unit_numberx' }]);
    fleet.addRow(['T4', new Date(Date.UTC(2024, 0, 2)), '<tag> & more']);
    wb.addWorksheet('Columns').addRow(['not', 'read']);
    const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-import-lo-'));
    const input = path.join(dir, 'fleet.xlsx');
    writeFileSync(input, new Uint8Array(await wb.xlsx.writeBuffer()));
    const saved = new Uint8Array(readFileSync(await recalculate(input, makeProfile())));
    expect(readZipDirectory(saved).some((e) => e.flags & 0x8)).toBe(true); // sizes in data descriptors
    const table = await readTable('fleet.xlsx', saved);
    expect(table.header).toEqual(['unit_number', 'engine_hours_h', 'notes']);
    expect(table.rows).toEqual([
      { row: 2, cells: ['T1', 9000, 'Révision – ok'] },
      { row: 4, cells: ['T3', 1.5, { formula: 'A1&"x"' }] },
      { row: 5, cells: ['T4', '2024-01-02T00:00:00.000Z', '<tag> & more'] },
    ]);
  });
});
