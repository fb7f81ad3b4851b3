/**
 * The workbook's row writer (lib/export/workbook.ts `rowXml`) writes what
 * exceljs's own row and cell serialisers write: the same workbook written
 * both ways reads back the same, cell for cell — value, formula, cached
 * result, style — and row for row (height).
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { describe, expect, it } from 'vitest';
import { evaluateCaseDetailed } from '@/lib/engine/evaluate';
import { FMT } from '@/lib/export/cells';
import type { WorkbookMeta } from '@/lib/export/types';
import { writeWorkbookBuffer } from '@/lib/export/workbook';
import { validateCase, type CaseFile } from '@/lib/validation/case';

const root = path.resolve(__dirname, '../..');
const v = validateCase(JSON.parse(readFileSync(path.join(root, 'scenarios/aldervane-north-pit.json'), 'utf8')));
if (!v.ok) throw new Error('demo case invalid');
const demo = v.value as CaseFile;

const meta: WorkbookMeta = {
  workspaceName: '=HYPERLINK("x")',
  status: 'approved',
  generatedAt: new Date('2026-12-01T08:00:00Z'),
  approval: { approvedBy: 'A <a@example.test>', approvedAt: '2026-12-01', hash: 'ab'.repeat(32) },
  trucks: { [demo.trucks[0].id]: { payloadClass: '+220 t', notes: 'left <front> & "rear"' } },
  plan: [{ title: 'Ranking', columns: [{ header: 'Rank', width: 8 }, { header: 'Unit' }, { header: 'Gain', format: FMT.money }], rows: [[1, demo.trucks[0].id, 12.5], [2, '@x', null]] }],
};

async function readBack(bytes: Buffer): Promise<string[]> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.load(bytes as unknown as ArrayBuffer);
  const out: string[] = [];
  wb.eachSheet((ws) => {
    ws.eachRow({ includeEmpty: true }, (row, n) => {
      out.push(`${ws.name}!${n} height ${row.height ?? ''}`);
      row.eachCell({ includeEmpty: true }, (c) => out.push(`${ws.name}!${c.address} ${c.type} ${JSON.stringify(c.value)} ${JSON.stringify(c.style)}`));
    });
  });
  return out;
}

describe('workbook row writer', () => {
  it('writes every row as exceljs writes it', async () => {
    const input = { caseFile: demo, evaluated: evaluateCaseDetailed(demo, { trusted: true }), meta };
    const [own, theirs] = await Promise.all([writeWorkbookBuffer(input), writeWorkbookBuffer(input, { exceljsRows: true })]);
    const [a, b] = await Promise.all([readBack(own), readBack(theirs)]);
    expect(a.length).toBeGreaterThan(100_000);
    expect(a.some((line) => line.includes('left <front> & \\"rear\\"'))).toBe(true);
    expect(a).toEqual(b);
  }, 120_000);
});
