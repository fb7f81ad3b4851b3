/**
 * The exported workbook's formulas are live: LibreOffice recomputes every
 * formula (a profile with OOXMLRecalcMode = 0) and the results agree with the
 * engine to 1e-6 relative, before and after changing the fuel price and the
 * discount rate in the Assumptions sheet. Needs `soffice` (LibreOffice Calc).
 */
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import ExcelJS from 'exceljs';
import { beforeAll, describe, expect, it } from 'vitest';
import { evaluateCase, evaluateCaseDetailed } from '@/lib/engine';
import type { CaseResult } from '@/lib/engine/types';
import { writeCaseWorkbook } from '@/lib/export/workbook';
import { validateCase, type CaseFile } from '@/lib/validation/case';
import { makeProfile, readWorkbook, recalculate, valueOf } from '../support/libreoffice';
import { readTruckFigures, type Figure, type TruckFigures } from '../support/workbook-reader';

const LO_TIMEOUT = 300_000;

function loadDemo(): CaseFile {
  const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../scenarios/aldervane-north-pit.json'), 'utf8'));
  const v = validateCase(raw);
  if (!v.ok) throw new Error('demo case does not validate');
  return v.value;
}

/** Every exported figure against the engine's JSON: 1e-6 relative (absolute near zero); null ⇔ "n/a". */
function mismatches(figs: TruckFigures[], result: CaseResult): string[] {
  const out: string[] = [];
  const check = (where: string, got: Figure, want: number | null) => {
    if (want === null) {
      if (got !== 'n/a') out.push(`${where}: workbook ${got}, engine null`);
      return;
    }
    if (typeof got !== 'number' || !(Math.abs(got - want) <= 1e-6 * Math.max(1, Math.abs(want)))) {
      out.push(`${where}: workbook ${got}, engine ${want}`);
    }
  };
  expect(figs.map((f) => f.id)).toEqual(result.trucks.map((t) => t.id));
  result.trucks.forEach((t, i) => {
    const f = figs[i];
    for (const p of ['keep', 'rebuild', 'repower'] as const) {
      for (const k of ['npv', 'eac', 'costPerHour', 'costPerTonne'] as const) check(`${t.id} ${p} ${k}`, f.policies[p][k], t.options[p][k]);
    }
    for (const c of ['repowerVsRebuild', 'repowerVsKeep', 'rebuildVsKeep'] as const) {
      for (const k of ['deltaNpv', 'irr', 'mirr', 'paybackYears', 'discountedPaybackYears', 'profitabilityIndex'] as const) {
        check(`${t.id} ${c} ${k}`, f.comparisons[c][k], t[c][k]);
      }
    }
  });
  return out;
}

/** The address a defined name points at, e.g. FuelPrice → Assumptions!B8. */
function namedCell(wb: ExcelJS.Workbook, name: string): ExcelJS.Cell {
  const ranges = wb.definedNames.getRanges(name).ranges;
  expect(ranges.length).toBe(1);
  const m = /^'?([^'!]+)'?!\$?([A-Z]+)\$?(\d+)$/.exec(ranges[0]);
  if (!m) throw new Error(`unexpected range ${ranges[0]}`);
  const ws = wb.getWorksheet(m[1]);
  if (!ws) throw new Error(`no sheet ${m[1]}`);
  return ws.getCell(`${m[2]}${m[3]}`);
}

describe('workbook recomputed by LibreOffice', () => {
  const demo = loadDemo();
  const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-wb-'));
  let profile: string;
  let exported: string;

  beforeAll(async () => {
    profile = makeProfile();
    exported = path.join(dir, 'demo.xlsx');
    writeFileSync(exported, await writeCaseWorkbook(demo, { workspaceName: 'Aldervane Copper — North Pit' }));
  });

  it('agrees with the engine on every NPV, EAC, IRR, MIRR, payback and discounted payback, and replaces a bogus cached value', async () => {
    // plant wrong cached results: a recomputing program must replace them
    const wb = await readWorkbook(exported);
    const truck1 = readTruckFigures(wb)[0];
    const ws = wb.getWorksheet(truck1.sheet) as ExcelJS.Worksheet;
    let npvCell: ExcelJS.Cell | undefined;
    ws.eachRow((row, r) => {
      if (!npvCell && row.getCell(1).value === 'NPV') npvCell = ws.getCell(r, 2);
    });
    const formula = (npvCell?.value as ExcelJS.CellFormulaValue).formula;
    expect(formula).toMatch(/^SUM\(/);
    (npvCell as ExcelJS.Cell).value = { formula, result: 123456789 } as ExcelJS.CellFormulaValue;
    const summary = wb.getWorksheet('Summary') as ExcelJS.Worksheet;
    const best = summary.getCell('F5');
    best.value = { formula: (best.value as ExcelJS.CellFormulaValue).formula, result: 'bogus' } as ExcelJS.CellFormulaValue;
    const planted = path.join(dir, 'planted.xlsx');
    await wb.xlsx.writeFile(planted);
    expect(readTruckFigures(await readWorkbook(planted))[0].policies.keep.npv).toBe(123456789);

    const recomputed = await readWorkbook(await recalculate(planted, profile));
    const figs = readTruckFigures(recomputed);
    const result = evaluateCase(demo);
    expect(figs[0].policies.keep.npv).not.toBe(123456789);
    expect(valueOf((recomputed.getWorksheet('Summary') as ExcelJS.Worksheet).getCell('F5'))).toBe(result.trucks[0].best);
    expect(mismatches(figs, result)).toEqual([]);
    // some IRRs exist and some are n/a by MODEL.md's rule: both paths are exercised
    const irrs = result.trucks.flatMap((t) => [t.repowerVsRebuild.irr, t.repowerVsKeep.irr, t.rebuildVsKeep.irr]);
    expect(irrs.some((x) => x === null)).toBe(true);
    expect(irrs.some((x) => x !== null)).toBe(true);
    // the IRR root count is decided by the piece test for most comparisons and on the whole grid for some:
    // both ways of counting are exercised (column J of each comparison table: −1 where the grid was scanned)
    const byPieces: unknown[] = [];
    for (const f of figs) {
      const sheet = recomputed.getWorksheet(f.sheet) as ExcelJS.Worksheet;
      sheet.eachRow((row, r) => {
        if (row.getCell(1).value === 'Comparison') for (let k = 1; k <= 3; k++) byPieces.push(valueOf(sheet.getCell(r + k, 10)));
      });
    }
    expect(byPieces).toHaveLength(3 * figs.length);
    expect(byPieces.some((x) => x === -1)).toBe(true);
    expect(byPieces.some((x) => typeof x === 'number' && x >= 0)).toBe(true);
    // fleet totals on the Summary sheet
    const total = (recomputed.getWorksheet('Summary') as ExcelJS.Worksheet).getCell(5 + demo.trucks.length, 7);
    expect(Math.abs((valueOf(total) as number) - result.fleet.npv.best)).toBeLessThan(1e-6 * Math.abs(result.fleet.npv.best));
  }, LO_TIMEOUT);

  it('recomputes to the engine after the fuel price and discount rate are changed in the Assumptions sheet', async () => {
    const wb = await readWorkbook(exported);
    const fuel = namedCell(wb, 'FuelPrice');
    const rate = namedCell(wb, 'DiscountRate');
    expect(fuel.value).toBe(demo.assumptions.fuelPrice);
    expect(rate.value).toBe(demo.assumptions.discountRate);
    fuel.value = 1.42;
    rate.value = 0.11;
    const changed = path.join(dir, 'changed.xlsx');
    await wb.xlsx.writeFile(changed);

    const recomputed = await readWorkbook(await recalculate(changed, profile));
    const expected = evaluateCase({ ...demo, assumptions: { ...demo.assumptions, fuelPrice: 1.42, discountRate: 0.11 } });
    const before = evaluateCase(demo);
    // the change matters: the figures move
    expect(Math.abs(expected.fleet.npv.best - before.fleet.npv.best)).toBeGreaterThan(1e5);
    expect(mismatches(readTruckFigures(recomputed), expected)).toEqual([]);
  }, LO_TIMEOUT);

  it('takes the lost-margin share and, on a swap brought forward by a failure, the failed core credit, live', async () => {
    // one-truck.json with an old engine that fails on the median path at 18,481 h, before its 20,000 h life
    const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../scenarios/one-truck.json'), 'utf8'));
    raw.engines[0].weibullScaleHours = 10000;
    raw.engines[0].weibullShape = 2;
    raw.repowerOffers[0].failedCoreCredit = 40000;
    raw.assumptions = { ...raw.assumptions, valuation: 'median-path', lostMarginShare: 0.6 };
    const v = validateCase(raw);
    if (!v.ok) throw new Error('case does not validate');
    const c = v.value;
    const swap = evaluateCaseDetailed(c).details[0].policies.repower.events.filter((e) => e.kind === 'repower');
    expect(swap.map((e) => [e.unplanned, Math.round(e.engineAge)])).toEqual([[true, 18481]]);

    const file = path.join(dir, 'failed-swap.xlsx');
    writeFileSync(file, await writeCaseWorkbook(c, { workspaceName: 'One truck' }));
    const recomputed = await readWorkbook(await recalculate(file, profile));
    expect(mismatches(readTruckFigures(recomputed), evaluateCase(c))).toEqual([]);

    // change the share and the failed core credit in the workbook: it recomputes to the engine
    const wb = await readWorkbook(file);
    const share = namedCell(wb, 'LostMarginShare');
    expect(share.value).toBe(0.6);
    share.value = 0.3;
    const offers = wb.getWorksheet('Offers') as ExcelJS.Worksheet;
    let col = 0;
    offers.getRow(4).eachCell((cell, k) => {
      if (String(cell.value).startsWith('Failed core credit')) col = k;
    });
    expect(offers.getCell(5, col).value).toBe(40000);
    offers.getCell(5, col).value = 15000;
    const changed = path.join(dir, 'failed-swap-changed.xlsx');
    await wb.xlsx.writeFile(changed);
    const again = await readWorkbook(await recalculate(changed, profile));
    const changedCase = structuredClone(c);
    changedCase.assumptions.lostMarginShare = 0.3;
    changedCase.repowerOffers[0].failedCoreCredit = 15000;
    const want = evaluateCase(changedCase);
    // both changes matter to the repower
    expect(Math.abs(want.trucks[0].options.repower.npv - evaluateCase(c).trucks[0].options.repower.npv)).toBeGreaterThan(1e4);
    expect(mismatches(readTruckFigures(again), want)).toEqual([]);
  }, LO_TIMEOUT);
});
