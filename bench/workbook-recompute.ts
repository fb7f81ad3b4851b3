/**
 * LibreOffice recomputing the exported workbook (issue: a consultant who
 * changes one input waits for every formula). For a synthetic 100-truck
 * case, in one run: the wall time of `soffice --headless --convert-to xlsx`
 * with a profile that recomputes every formula on load (OOXMLRecalcMode 0,
 * as tests/support/libreoffice.ts does), against the same workbook with every
 * formula replaced by its value (what opening and saving costs with nothing
 * to compute). Median of 3 of each, interleaved. Target: ratio ≤ 1.5, judged
 * on the CPU time of soffice when GNU time reports it (steadier than the wall
 * time on a shared machine), else on the wall time; both are printed.
 * Then whether a 2,000-truck workbook recomputes at all (one run, timed).
 * Skipped, saying so, where `soffice` is not installed.
 */
import { spawn, spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, rmSync, statSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { readFileSync } from 'node:fs';
import ExcelJS from 'exceljs';
import { writeCaseWorkbook } from '@/lib/export/workbook';
import { validateCase, type CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './support/synthetic-fleet';

const RECALC_ALWAYS = `<?xml version="1.0" encoding="UTF-8"?>
<oor:items xmlns:oor="http://openoffice.org/2001/registry" xmlns:xs="http://www.w3.org/2001/XMLSchema" xmlns:xsi="http://www.w3.org/2001/XMLSchema-instance">
<item oor:path="/org.openoffice.Office.Calc/Formula/Load"><prop oor:name="OOXMLRecalcMode" oor:op="fuse"><value>0</value></prop></item>
</oor:items>
`;

function load(): string {
  return os.loadavg()[0].toFixed(2);
}

/** Wall ms of one LibreOffice conversion (recomputing on load) of `input`, and its peak resident memory. */
function convert(profile: string, input: string, timeoutMs: number): Promise<{ ms: number; cpuMs: number | null; ok: boolean; peakMiB: number | null }> {
  const outDir = mkdtempSync(path.join(os.tmpdir(), 'haulcase-bench-lo-out-'));
  const t0 = performance.now();
  return new Promise((resolve) => {
    // GNU time, when present, reports the peak resident set of soffice and its children
    const time = spawnSync('sh', ['-c', 'command -v /usr/bin/time'], { encoding: 'utf8' }).stdout.trim();
    const args = [`-env:UserInstallation=file://${profile}`, '--headless', '--norestore', '--convert-to', 'xlsx', '--outdir', outDir, input];
    const [cmd, argv] = time ? [time, ['-f', 'PEAKKB %M CPU %U %S', 'soffice', ...args]] : ['soffice', args];
    // its own process group, so a timeout ends soffice.bin too (not only the wrapper that started it)
    const child = spawn(cmd, argv, { detached: true, stdio: ['ignore', 'ignore', 'pipe'] });
    let stderr = '';
    child.stderr.on('data', (b: Buffer) => (stderr = (stderr + b.toString()).slice(-4096)));
    let timedOut = false;
    const timer = setTimeout(() => {
      timedOut = true;
      try {
        process.kill(-(child.pid as number), 'SIGKILL');
      } catch {
        // already gone
      }
    }, timeoutMs);
    child.on('close', (code) => {
      clearTimeout(timer);
      const ms = performance.now() - t0;
      const m = /PEAKKB (\d+) CPU ([\d.]+) ([\d.]+)/.exec(stderr);
      let ok = !timedOut && code === 0;
      try {
        ok = ok && statSync(path.join(outDir, path.basename(input))).size > 0;
      } catch {
        ok = false;
      }
      rmSync(outDir, { recursive: true, force: true });
      resolve({ ms, ok, peakMiB: m ? Number(m[1]) / 1024 : null, cpuMs: m ? (Number(m[2]) + Number(m[3])) * 1000 : null });
    });
  });
}

/** The same workbook with every formula cell replaced by its cached value (the engine's figure). */
async function asValues(file: string, out: string): Promise<void> {
  const wb = new ExcelJS.Workbook();
  await wb.xlsx.readFile(file);
  wb.eachSheet((ws) =>
    ws.eachRow((row) =>
      row.eachCell((cell) => {
        const v = cell.value;
        if (v && typeof v === 'object' && 'formula' in v) {
          const r = (v as ExcelJS.CellFormulaValue).result;
          cell.value = r === undefined || (typeof r === 'object' && r !== null) ? null : (r as ExcelJS.CellValue);
        }
      }),
    ),
  );
  await wb.xlsx.writeFile(out);
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[s.length >> 1];
}

export async function run(): Promise<void> {
  if (spawnSync('sh', ['-c', 'command -v soffice']).status !== 0) {
    console.log('LibreOffice (soffice) not installed: workbook recompute not measured');
    return;
  }
  const dir = mkdtempSync(path.join(os.tmpdir(), 'haulcase-bench-recompute-'));
  const profile = path.join(dir, 'profile');
  mkdirSync(path.join(profile, 'user'), { recursive: true });
  writeFileSync(path.join(profile, 'user', 'registrymodifications.xcu'), RECALC_ALWAYS);
  const base = JSON.parse(readFileSync(path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
  const write = async (size: number): Promise<string> => {
    const v = validateCase(syntheticFleet(base, size));
    if (!v.ok) throw new Error('synthetic case does not validate');
    const file = path.join(dir, `fleet-${size}.xlsx`);
    writeFileSync(file, await writeCaseWorkbook(v.value));
    return file;
  };
  try {
    const live = await write(100);
    const values = path.join(dir, 'fleet-100-values.xlsx');
    await asValues(live, values);
    await convert(profile, values, 300_000); // the first start of a new profile sets it up: not timed
    const liveMs: number[] = [];
    const valueMs: number[] = [];
    const liveCpu: number[] = [];
    const valueCpu: number[] = [];
    for (let i = 0; i < 3; i++) {
      const a = await convert(profile, values, 300_000);
      valueMs.push(a.ms);
      if (a.cpuMs !== null) valueCpu.push(a.cpuMs);
      const r = await convert(profile, live, 300_000);
      if (!r.ok) throw new Error('LibreOffice did not convert the 100-truck workbook');
      liveMs.push(r.ms);
      if (r.cpuMs !== null) liveCpu.push(r.cpuMs);
    }
    const wall = median(liveMs) / median(valueMs);
    const cpu = liveCpu.length === 3 && valueCpu.length === 3 ? median(liveCpu) / median(valueCpu) : null;
    console.log(
      `LibreOffice, 100 trucks: recompute ${(median(liveMs) / 1000).toFixed(2)} s, as values ${(median(valueMs) / 1000).toFixed(2)} s ` +
        `(wall, medians of 3, ${(statSync(live).size / 2 ** 20).toFixed(2)} MiB): ${wall.toFixed(2)}×` +
        (cpu === null ? '' : `; CPU ${(median(liveCpu) / 1000).toFixed(2)} s against ${(median(valueCpu) / 1000).toFixed(2)} s: ${cpu.toFixed(2)}×`) +
        `; load average ${load()}`,
    );
    const ratio = cpu ?? wall;
    console.log(
      `target: LibreOffice recomputes 100 trucks in ≤ 1.5× the time of the values → ${ratio <= 1.5 ? 'met' : 'NOT met'} (${ratio.toFixed(2)}×, ${cpu === null ? 'wall' : 'CPU'} time)`,
    );

    const big = await write(2000);
    const r = await convert(profile, big, 1_200_000);
    console.log(
      `LibreOffice, 2,000 trucks: ${r.ok ? 'recomputed' : 'did NOT finish'} in ${(r.ms / 1000).toFixed(1)} s` +
        `${r.cpuMs === null ? '' : ` (CPU ${(r.cpuMs / 1000).toFixed(1)} s)`}${r.peakMiB === null ? '' : `, peak ${r.peakMiB.toFixed(0)} MiB`} (${(statSync(big).size / 2 ** 20).toFixed(1)} MiB); load average ${load()}`,
    );
    console.log(`target: a 2,000-truck workbook recomputes at all → ${r.ok ? 'met' : 'NOT met'}`);
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
