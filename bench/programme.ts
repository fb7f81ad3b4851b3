/**
 * The fleet programme (issue 15): every truck's timing options valued in
 * expectation (keep, rebuild, now, k = 1..3, delays 0..6 months) plus the
 * MILP solved by HiGHS with its marginal re-solves, for the demo case
 * (scenarios/aldervane-north-pit.json), a 28-truck fleet and a 100-truck
 * fleet with 5 fiscal years of budgets and 60 months of shop capacity.
 * Target: 100 trucks in 2 s or less (valuing plus solving).
 */
import { loadavg } from 'node:os';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { clearExpectedQuantities } from '@/lib/engine/expected';
import { loadHighs } from '@/lib/plan/programme';
import { planProgramme } from '@/lib/plan/programme-case';
import type { CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './support/synthetic-fleet';

async function once(label: string, c: CaseFileInput, budgetShare = 0.4): Promise<number> {
  // budgets that bind: 40 % of a repower for every truck spread over 5 years (or `budgetShare`); 2 swaps a month, month 4 shut
  const budgets = [0, 1, 2, 3, 4].map(() => Math.round((c.trucks.length * 1.5e6 * budgetShare) / 5));
  const capacity = Array.from({ length: 60 }, (_, m) => (m === 3 ? 0 : 2));
  clearExpectedQuantities();
  const t0 = performance.now();
  const cpu0 = process.cpuUsage();
  const p = await planProgramme(c, { budgets, capacity, maxK: 3, maxDelayMonths: 6 });
  const ms = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  const cpuMs = (cpu.user + cpu.system) / 1000;
  const options = p.options.reduce((s, t) => s + t.options.length, 0);
  const r = p.result;
  console.log(
    `${label.padEnd(28)} ${ms.toFixed(0).padStart(6)} ms wall, ${cpuMs.toFixed(0).padStart(6)} ms cpu  (${options} options, solver ${r.status}, gap ${r.gap}, ` +
      `${(r.seconds * 1000).toFixed(0)} ms in HiGHS incl. the values of ${r.binding.length} binding constraints; load ${loadavg()[0].toFixed(2)})`,
  );
  return cpuMs;
}

export async function run(): Promise<void> {
  await loadHighs();
  const base = JSON.parse(readFileSync(path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json'), 'utf8')) as CaseFileInput;
  let hundred = Number.POSITIVE_INFINITY;
  for (let repeat = 1; repeat <= 2; repeat++) {
    await once(`demo case, ${base.trucks.length} trucks`, base);
    await once('28 trucks', syntheticFleet(base, 28));
    hundred = Math.min(hundred, await once('100 trucks', syntheticFleet(base, 100)));
  }
  // budgets doubled: more swaps fit, so many more months bind (each valued by its own re-solve)
  await once('100 trucks, budgets doubled', syntheticFleet(base, 100), 0.8);
  // judged on CPU time: the wall clock on a shared machine mostly measures the other work (see the load)
  console.log(`target: 100 trucks ≤ 2 s (valuing the options plus solving, cpu) → ${hundred <= 2000 ? 'met' : 'NOT met'} (${hundred.toFixed(0)} ms)`);
}
