/**
 * Formula injection: unit numbers, names and notes that look like formulas
 * come out of LibreOffice as the same text, never as a formula or its result.
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { writeCaseWorkbook } from '@/lib/export/workbook';
import { validateCase, type CaseFileInput } from '@/lib/validation/case';
import { makeProfile, readWorkbook, recalculate } from '../support/libreoffice';

const HOSTILE = ['=1+2', '+3+4', '-5+6', '@SUM(7,8)', '=HYPERLINK("http://example.test","open")', "='Assumptions'!B5*100"];

function cellsWith(ws: ExcelJS.Worksheet, text: string): ExcelJS.Cell[] {
  const out: ExcelJS.Cell[] = [];
  ws.eachRow((row) => row.eachCell((c) => {
    if (c.value === text) out.push(c);
  }));
  return out;
}

describe('hostile text in the workbook', () => {
  it('stays inert text after LibreOffice opens and recomputes the file', async () => {
    const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../scenarios/one-truck.json'), 'utf8')) as CaseFileInput;
    const base = raw.trucks[0];
    raw.trucks = HOSTILE.slice(0, 4).map((id, i) => ({ ...base, id, engineHours: base.engineHours + i * 500 }));
    raw.name = HOSTILE[4];
    const v = validateCase(raw);
    if (!v.ok) throw new Error(v.problems.map((p) => `${p.path}: ${p.message}`).join('; '));
    const trucks = Object.fromEntries(HOSTILE.slice(0, 4).map((id) => [id, { notes: HOSTILE[5], payloadClass: '=9*9' }]));
    const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-inj-'));
    const file = path.join(dir, 'hostile.xlsx');
    writeFileSync(file, await writeCaseWorkbook(v.value, { workspaceName: '@cmd', trucks, assumptionSetName: '-1-1' }));

    const wb = await readWorkbook(await recalculate(file, makeProfile()));
    const summary = wb.getWorksheet('Summary') as ExcelJS.Worksheet;
    const trucksWs = wb.getWorksheet('Trucks') as ExcelJS.Worksheet;
    const cover = wb.getWorksheet('Cover') as ExcelJS.Worksheet;
    HOSTILE.slice(0, 4).forEach((id, i) => {
      expect(summary.getCell(5 + i, 1).value).toBe(id);
      expect(trucksWs.getCell(5 + i, 1).value).toBe(id);
      expect(trucksWs.getCell(5 + i, 16).value).toBe(HOSTILE[5]);
      expect(trucksWs.getCell(5 + i, 2).value).toBe('=9*9');
      const sheet = wb.getWorksheet(String(summary.getCell(5 + i, 15).value)) as ExcelJS.Worksheet;
      expect(sheet.getCell('B1').value).toBe(id);
    });
    expect(cellsWith(cover, HOSTILE[4])).toHaveLength(1);
    expect(cellsWith(cover, '@cmd')).toHaveLength(1);
    expect(cellsWith(cover, '-1-1')).toHaveLength(1);
    // and nothing anywhere became a formula built from that text
    for (const ws of wb.worksheets) {
      ws.eachRow((row) => row.eachCell((c) => {
        const f = (c.value as { formula?: string } | null)?.formula;
        // quoted sheet names ('T4 SUM(7_8)'!) are references, not text that runs
        if (f) expect(f.replace(/'(?:[^']|'')*'!/g, '')).not.toMatch(/HYPERLINK|SUM\(7|1\+2|9\*9/);
      }));
    }
  }, 300_000);
});
