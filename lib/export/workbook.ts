/**
 * The case workbook (issue 6): cover, summary, assumptions with defined
 * names, depreciation shares, the engine/offer/truck tables, one sheet per
 * truck with live formulas, the plan when there is one, and the IRR grid.
 * Server-side only: exceljs in, a Buffer out.
 */
import ExcelJS from 'exceljs';
import { evaluateCaseDetailed } from '@/lib/engine/evaluate';
import type { CaseFile } from '@/lib/validation/case';
import { addAssumptionsSheet } from './sheet-assumptions';
import { addCoverSheet } from './sheet-cover';
import { addDepreciationSheet } from './sheet-depreciation';
import { addIrrGridSheet, irrGridRefs } from './sheet-irr-grid';
import { addLibrarySheets } from './sheet-library';
import { addPlanSheet } from './sheet-plan';
import { fillSummarySheet, SUMMARY_SHEET } from './sheet-summary';
import { addTruckSheet, truckSheetName } from './sheet-truck';
import type { WorkbookInput, WorkbookMeta } from './types';

export function buildWorkbook({ caseFile: c, evaluated, meta }: WorkbookInput): ExcelJS.Workbook {
  const wb = new ExcelJS.Workbook();
  wb.creator = 'Haulcase';
  wb.created = meta.generatedAt ?? new Date();
  wb.title = c.name;
  // a program that honours this recomputes on open instead of trusting cached values
  wb.calcProperties = { fullCalcOnLoad: true };
  const { result, details } = evaluated;
  const maxN = Math.max(...result.trucks.map((t) => t.horizonYears));

  addCoverSheet(wb, c, meta);
  const summary = wb.addWorksheet(SUMMARY_SHEET);
  addAssumptionsSheet(wb, c);
  const dep = addDepreciationSheet(wb, maxN + 1);
  const lib = addLibrarySheets(wb, c, details, meta);
  const taken = new Set<string>(wb.worksheets.map((w) => w.name.toLowerCase()).concat(['plan', 'irr grid']));
  const horizons = result.trucks.map((t) => t.horizonYears);
  const grid = irrGridRefs(maxN, horizons);
  const refs = c.trucks.map((t, i) =>
    addTruckSheet(wb, truckSheetName(i, t.id, taken), c, t, details[i], result.trucks[i], lib, dep, grid),
  );
  fillSummarySheet(summary, result, refs, c.currency);
  if (meta.plan && meta.plan.length) addPlanSheet(wb, meta.plan);
  addIrrGridSheet(wb, maxN, horizons);
  return wb;
}

/** Evaluate a validated case and write its workbook. */
export async function writeCaseWorkbook(c: CaseFile, meta: WorkbookMeta = {}): Promise<Buffer> {
  const evaluated = evaluateCaseDetailed(c, { trusted: true });
  const wb = buildWorkbook({ caseFile: c, evaluated, meta });
  const out = await wb.xlsx.writeBuffer();
  return Buffer.from(out as ArrayBuffer);
}
