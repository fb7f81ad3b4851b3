/**
 * One sheet per truck: a heading, the keep, rebuild and repower blocks under
 * one frozen header row, then the comparisons.
 */
import type ExcelJS from 'exceljs';
import type { TruckDetail, TruckResult } from '@/lib/engine/types';
import type { CaseFile, Truck } from '@/lib/validation/case';
import { FMT, printSetup, setText, styleHeader } from './cells';
import { comparisonRefs, writeComparisons, type ComparisonKey, type ComparisonRefs } from './compare-block';
import { blockHeaders, blockRefs, writePolicyBlock, type BlockRefs } from './policy-block';
import type { DepreciationRefs } from './sheet-depreciation';
import type { IrrGridRefs } from './sheet-irr-grid';
import type { LibraryRefs } from './sheet-library';

export interface TruckSheetRefs {
  sheet: string;
  blocks: Record<'keep' | 'rebuild' | 'repower', BlockRefs>;
  comparisons: Record<ComparisonKey, ComparisonRefs>;
}

/**
 * A sheet name from the truck's position and its unit number, reduced to
 * characters every spreadsheet accepts in a name (31 at most). The unit
 * number itself is written, as text, in the sheet's heading.
 */
export function truckSheetName(index: number, id: string, taken: Set<string>): string {
  const clean = id.replace(/[^A-Za-z0-9 _.()-]/g, '_').replace(/^[_ ]+/, '');
  let name = `T${index + 1} ${clean}`.slice(0, 31).trim();
  for (let k = 2; taken.has(name.toLowerCase()); k++) name = `T${index + 1}-${k}`;
  taken.add(name.toLowerCase());
  return name;
}

const POLICIES = ['keep', 'rebuild', 'repower'] as const;
const FIRST_BLOCK_ROW = 5;

/**
 * Where the sheet of a truck with horizon n puts its figures, without
 * writing it: the Summary (second in the workbook) refers to them, and a
 * streamed workbook writes its sheets in order.
 */
export function truckSheetRefs(sheet: string, n: number): TruckSheetRefs {
  let row = FIRST_BLOCK_ROW;
  const blocks = {} as TruckSheetRefs['blocks'];
  for (const policy of POLICIES) {
    blocks[policy] = blockRefs(row, n);
    row = blocks[policy].nextRow;
  }
  return { sheet, blocks, comparisons: comparisonRefs(row, n) };
}

export function addTruckSheet(
  wb: ExcelJS.Workbook,
  name: string,
  c: CaseFile,
  truck: Truck,
  detail: TruckDetail,
  result: TruckResult,
  lib: LibraryRefs,
  dep: DepreciationRefs,
  grid: IrrGridRefs,
): TruckSheetRefs {
  const ws = wb.addWorksheet(name, { views: [{ state: 'frozen', ySplit: 4, xSplit: 1 }], ...printSetup('4:4') });
  ws.getColumn(1).width = 44; // labels of the result rows sit in column A
  for (let col = 2; col <= 34; col++) ws.getColumn(col).width = 13;
  ws.getCell('A1').value = 'Truck';
  ws.getCell('A1').font = { bold: true, size: 14 };
  setText(ws.getCell('B1'), truck.id);
  ws.getCell('B1').font = { bold: true, size: 14 };
  ws.getCell('A2').value = 'Engine now';
  setText(ws.getCell('B2'), detail.startEngineId);
  ws.getCell('D2').value = 'Repower offer';
  setText(ws.getCell('E2'), detail.repowerOfferId);
  ws.getCell('G2').value = 'Repower engine';
  setText(ws.getCell('H2'), detail.repowerEngineId);
  ws.getCell('A3').value = 'Annual hours (h)';
  ws.getCell('B3').value = truck.annualHours;
  ws.getCell('B3').numFmt = FMT.hours;
  ws.getCell('D3').value = 'Horizon N (years)';
  ws.getCell('E3').value = detail.horizonYears;
  ws.getCell('G3').value = 'Currency';
  setText(ws.getCell('H3'), c.currency);
  const header = ws.getRow(4);
  header.values = blockHeaders(c.currency);
  header.height = 58;
  styleHeader(header);

  const ctx = { ws, caseFile: c, truck: detail, annualHours: truck.annualHours, horizonCell: '$E$3', lib, dep };
  let row = FIRST_BLOCK_ROW;
  const blocks = {} as TruckSheetRefs['blocks'];
  for (const policy of POLICIES) {
    blocks[policy] = writePolicyBlock(ctx, detail.policies[policy], result.options[policy], row);
    row = blocks[policy].nextRow;
  }
  const comparisons = writeComparisons(ws, result, blocks, grid, row);
  ws.commit();
  return { sheet: name, blocks, comparisons };
}
