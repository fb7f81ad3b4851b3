/**
 * Sensitivity where users wait (issue 18): the fleet tornado (fleet Δnpv,
 * every listed driver over its realistic range, the default; and at ±20 %) at 24 trucks (the demo) and 200 (a synthetic
 * fleet), and the demo's break-evens over every driver, with the expected
 * valuation (the default) — each run on the touched-trucks evaluator and on
 * the plain whole-case re-evaluation, the same numbers (a property test
 * holds it). Median of several runs with the load average. Target: the
 * 200-truck tornado ≤ 150 ms.
 */
import { loadavg } from 'node:os';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { validateCase } from '@/lib/engine';
import { breakEvens, listDrivers, makeEvaluator, makeFullEvaluator, tornado, type Evaluator, type Metric } from '@/lib/engine/sensitivity';
import type { CaseFileInput } from '@/lib/validation/case';
import { syntheticFleet } from './support/synthetic-fleet';

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

function time(label: string, fn: () => unknown, runs: number): number {
  fn(); // warm-up (renewal tables and quantities cached for the base case)
  const samples: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    samples.push(performance.now() - t0);
  }
  const m = median(samples);
  console.log(`${label.padEnd(48)} median ${m.toFixed(1).padStart(9)} ms   (${runs} runs, load ${loadavg()[0].toFixed(2)})`);
  return m;
}

function valid(c: CaseFileInput): CaseFileInput {
  const v = validateCase(c);
  if (!v.ok) throw new Error('bench case invalid');
  return v.value;
}

export async function run(): Promise<void> {
  const file = path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json');
  const demo = valid(JSON.parse(readFileSync(file, 'utf8')) as CaseFileInput);
  const fleet: Metric = { kind: 'fleet-delta' };
  const make = (full: boolean, c: CaseFileInput): Evaluator => (full ? makeFullEvaluator(c, fleet) : makeEvaluator(c, fleet));
  let tornado200 = Infinity;
  for (const [name, c] of [['24 trucks (demo)', demo], ['200 trucks', valid(syntheticFleet(demo, 200))]] as const) {
    const drivers = listDrivers(c);
    for (const full of [true, false]) {
      const m = time(`tornado, ${name}, ${drivers.length} drivers, ${full ? 'every truck' : 'touched trucks'}`, () => tornado(make(full, c), drivers), full ? 1 : 5);
      if (!full && c !== demo) tornado200 = m;
      if (!full) time(`tornado ±20 %, ${name}, touched trucks`, () => tornado(make(false, c), drivers, {}, 0.2), 5);
    }
  }
  const drivers = listDrivers(demo);
  for (const full of [true, false]) {
    // seconds a run: one timed run after the warm-up
    time(`break-even, demo, ${drivers.length} drivers, ${full ? 'every truck' : 'touched trucks'}`, () => breakEvens(make(full, demo), drivers), 1);
  }
  const physical = drivers.find((d) => d.key === 'weibullScaleHours')!;
  for (const full of [true, false]) {
    time(`break-even, demo, ${physical.key}@${physical.target}, ${full ? 'every truck' : 'touched trucks'}`, () => breakEvens(make(full, demo), [physical]), 3);
  }
  console.log(`target: 200-truck fleet tornado ≤ 150 ms → ${tornado200 <= 150 ? 'met' : 'NOT met'} (${tornado200.toFixed(1)} ms)`);
}
