/**
 * Recompute a workbook in LibreOffice headless with a throw-away profile
 * whose OOXMLRecalcMode is 0 ("always"), so every formula is recomputed on
 * load rather than read from the cached values; then read it back with exceljs.
 */
import { execFile } from 'node:child_process';
import { mkdirSync, mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import ExcelJS from 'exceljs';

const run = promisify(execFile);

const RECALC_ALWAYS = `<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>
</oor:items>
`;

export function makeProfile(): string {
  const dir = mkdtempSync(path.join(tmpdir(), 'haulcase-lo-'));
  mkdirSync(path.join(dir, 'user'), { recursive: true });
  writeFileSync(path.join(dir, 'user', 'registrymodifications.xcu'), RECALC_ALWAYS);
  return dir;
}

/** Converts `input` (xlsx) to xlsx in a new folder, LibreOffice recomputing it; returns the new file's path. */
export async function recalculate(input: string, profile: string): Promise<string> {
  const outDir = mkdtempSync(path.join(tmpdir(), 'haulcase-lo-out-'));
  await run(
    'soffice',
    [`-env:UserInstallation=file://${profile}`, '--headless', '--norestore', '--convert-to', 'xlsx', '--outdir', outDir, input],
    { timeout: 240_000 },
  );
  return path.join(outDir, path.basename(input));
}

export async function readWorkbook(file: string): Promise<ExcelJS.Workbook> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  return wb;
}

/** A cell's value as LibreOffice left it: the formula's result, or the plain value. */
export function valueOf(cell: ExcelJS.Cell): unknown {
  const v = cell.value;
  if (v && typeof v === 'object' && 'formula' in v) {
    const r = (v as ExcelJS.CellFormulaValue).result;
    // exceljs leaves `result` out when a formula's value is 0
    return r === undefined ? 0 : r;
  }
  return v;
}
