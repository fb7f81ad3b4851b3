/**
 * Reads the figures of an exported case workbook by its labels (not by its
 * internal layout): each truck sheet's three policy blocks (NPV, EAC, cost
 * per hour and per tonne, in the order keep, rebuild, repower) and its
 * comparison table.
 */
import type ExcelJS from 'exceljs';
import { valueOf } from './libreoffice';

export type Figure = number | 'n/a';
export interface TruckFigures {
  id: string;
  sheet: string;
  policies: Record<'keep' | 'rebuild' | 'repower', { npv: Figure; eac: Figure; costPerHour: Figure; costPerTonne: Figure }>;
  comparisons: Record<'repowerVsRebuild' | 'repowerVsKeep' | 'rebuildVsKeep', {
    deltaNpv: Figure; irr: Figure; mirr: Figure; paybackYears: Figure; discountedPaybackYears: Figure; profitabilityIndex: Figure;
  }>;
}

function fig(v: unknown, where: string): Figure {
  if (typeof v === 'number') return v;
  if (v === 'n/a') return 'n/a';
  throw new Error(`${where}: expected a number or "n/a", got ${JSON.stringify(v)}`);
}

export function readTruckFigures(wb: ExcelJS.Workbook): TruckFigures[] {
  const summary = wb.getWorksheet('Summary');
  if (!summary) throw new Error('no Summary sheet');
  const out: TruckFigures[] = [];
  for (let r = 5; ; r++) {
    const id = summary.getCell(r, 1).value;
    const sheetName = summary.getCell(r, 15).value;
    if (typeof sheetName !== 'string') break;
    const ws = wb.getWorksheet(sheetName);
    if (!ws) throw new Error(`no sheet ${sheetName}`);
    const labels = new Map<string, number[]>();
    ws.eachRow((row, n) => {
      const label = row.getCell(1).value;
      if (typeof label === 'string') labels.set(label, [...(labels.get(label) ?? []), n]);
    });
    const at = (label: string, i: number) => {
      const rows = labels.get(label);
      if (!rows || rows[i] === undefined) throw new Error(`${sheetName}: no row "${label}" #${i}`);
      return rows[i];
    };
    const b = (label: string, i: number) => fig(valueOf(ws.getCell(at(label, i), 2)), `${sheetName} ${label}`);
    const policies = {} as TruckFigures['policies'];
    (['keep', 'rebuild', 'repower'] as const).forEach((p, i) => {
      policies[p] = { npv: b('NPV', i), eac: b('Equivalent annual cost (EAC)', i), costPerHour: b('Cost per operating hour', i), costPerTonne: b('Cost per tonne', i) };
    });
    const comparisons = {} as TruckFigures['comparisons'];
    const labelsOf = { repowerVsRebuild: 'Repower vs rebuild', repowerVsKeep: 'Repower vs keep', rebuildVsKeep: 'Rebuild vs keep' } as const;
    for (const [key, label] of Object.entries(labelsOf) as [keyof typeof labelsOf, string][]) {
      const rows = labels.get(label) ?? [];
      const r2 = rows[rows.length - 1]; // the results table, below the per-year headings
      const c = (col: number, name: string) => fig(valueOf(ws.getCell(r2, col)), `${sheetName} ${label} ${name}`);
      comparisons[key] = {
        deltaNpv: c(2, 'ΔNPV'), irr: c(3, 'IRR'), mirr: c(6, 'MIRR'), paybackYears: c(7, 'payback'),
        discountedPaybackYears: c(8, 'discounted payback'), profitabilityIndex: c(9, 'PI'),
      };
    }
    out.push({ id: String(id), sheet: sheetName, policies, comparisons });
  }
  return out;
}
