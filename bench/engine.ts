/**
 * Warm evaluation of synthetic fleets of 10, 100 and 1,000 trucks in both
 * valuations: median milliseconds per evaluation and evaluations per second,
 * the load average beside each figure, and the ratio expected / median path
 * measured in the same run. Targets: 100 trucks in 5 ms or less on the median
 * path, 25 ms or less with the expected valuation (warm: the renewal tables
 * of the engine types and each truck's expected quantities cached, as in a
 * sensitivity run moving a price); "quantities recomputed" is the cost when
 * a physical input (hours, lives, Weibull figures) has changed.
 */
import { loadavg } from 'node:os';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { evaluateCase, evaluateNpvs, irr, scanIrrRoots } from '@/lib/engine';
import { clearExpectedQuantities } from '@/lib/engine/expected';
import { setGridRefinement } from '@/lib/engine/renewal';
import type { CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './support/synthetic-fleet';

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Median wall-clock ms per call after a warm-up, and the process CPU ms per
 * call over the same runs (steadier when other work shares the machine).
 */
function time(label: string, fn: () => void, minMs = 1500): { medianMs: number; cpuMs: number } {
  for (let i = 0; i < 5; i++) fn(); // warm-up
  const samples: number[] = [];
  const cpu0 = process.cpuUsage();
  const started = performance.now();
  while (performance.now() - started < minMs || samples.length < 10) {
    const t0 = performance.now();
    fn();
    samples.push(performance.now() - t0);
  }
  const cpu = process.cpuUsage(cpu0);
  const cpuMs = (cpu.user + cpu.system) / 1000 / samples.length;
  const m = median(samples);
  console.log(
    `${label.padEnd(30)} median ${m.toFixed(3).padStart(9)} ms  ${(1000 / m).toFixed(1).padStart(8)} evaluations/s` +
      `   cpu ${cpuMs.toFixed(3).padStart(8)} ms/evaluation   (${samples.length} runs, load ${loadavg()[0].toFixed(2)})`,
  );
  return { medianMs: m, cpuMs };
}

export async function run(): Promise<void> {
  const file = path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json');
  const base = JSON.parse(readFileSync(file, 'utf8')) as CaseFileInput;
  const hundred = { expected: 0, median: 0 };
  for (let repeat = 1; repeat <= 2; repeat++) {
    console.log(`-- repeat ${repeat}`);
    for (const size of [10, 100, 1000]) {
      const fleet = syntheticFleet(base, size);
      const median = structuredClone(fleet);
      median.assumptions.valuation = 'median-path';
      const expected = structuredClone(fleet);
      expected.assumptions.valuation = 'expected';
      const m = time(`median path, ${size} trucks`, () => evaluateCase(median), size === 1000 ? 3000 : 1500);
      const e = time(`expected, ${size} trucks`, () => evaluateCase(expected), size === 1000 ? 3000 : 1500);
      time(`  expected, npvs only`, () => evaluateNpvs(expected, { trusted: true }));
      // the figure a changed physical input costs: every truck's expected quantities recomputed (renewal tables cached)
      time(`  expected, quantities recomputed`, () => {
        clearExpectedQuantities();
        evaluateCase(expected);
      }, size === 1000 ? 3000 : 1500);
      console.log(`  ratio expected / median path at ${size} trucks: ${(e.medianMs / m.medianMs).toFixed(1)}×`);
      if (size === 100) {
        hundred.median = m.medianMs;
        hundred.expected = e.medianMs;
      }
    }
  }
  // small Weibull shape (β = 0.5, the smallest the case file takes): the renewal tables of the finer β < 1 scheme, built cold
  const small = syntheticFleet(base, 100);
  small.assumptions.valuation = 'expected';
  for (const e of small.engines) e.weibullShape = 0.5;
  {
    // one run (each takes seconds): the tables of every truck's own grid step built from nothing
    setGridRefinement(1); // clears the renewal tables
    clearExpectedQuantities();
    const t0 = performance.now();
    evaluateCase(small);
    console.log(`${'expected, 100 trucks, β = 0.5, tables cold'.padEnd(30)} ${(performance.now() - t0).toFixed(0).padStart(9)} ms (one run, load ${loadavg()[0].toFixed(2)})`);
  }
  time(`expected, 100 trucks, β = 0.5, warm`, () => evaluateCase(small));
  // the IRRs of the 100-truck fleet's 300 comparisons: the fast search against the 11,000-rate scan
  const median100 = structuredClone(syntheticFleet(base, 100));
  median100.assumptions.valuation = 'median-path';
  const flows = evaluateCase(median100).trucks.flatMap((t) =>
    (['repower', 'rebuild', 'repower', 'keep', 'rebuild', 'keep'] as const).reduce<number[][]>((out, p, i, all) => {
      if (i % 2 === 0) out.push(t.options[p].cashFlows.map((v, y) => v - t.options[all[i + 1]].cashFlows[y]));
      return out;
    }, []),
  );
  const fast = time(`IRR of 300 comparisons`, () => flows.forEach((d) => irr(d)));
  const scan = time(`  same, 11,000-rate scan`, () => flows.forEach((d) => scanIrrRoots(d)), 3000);
  console.log(`  IRR share of the 100-truck median-path evaluation: ${((100 * fast.medianMs) / hundred.median).toFixed(0)} %; scan / fast ${(scan.medianMs / fast.medianMs).toFixed(0)}×`);
  console.log(`target: 100 trucks ≤ 1 ms warm on the median path → ${hundred.median <= 1 ? 'met' : 'NOT met'} (${hundred.median.toFixed(3)} ms, load ${loadavg()[0].toFixed(2)})`);
  console.log(`target: 100 trucks ≤ 5 ms warm on the median path → ${hundred.median <= 5 ? 'met' : 'NOT met'} (${hundred.median.toFixed(3)} ms)`);
  console.log(`target: 100 trucks ≤ 25 ms warm with the expected valuation → ${hundred.expected <= 25 ? 'met' : 'NOT met'} (${hundred.expected.toFixed(3)} ms)`);
}
