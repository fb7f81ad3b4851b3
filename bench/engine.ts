/**
 * Warm evaluation of synthetic fleets of 10, 100 and 1,000 trucks: median
 * milliseconds per evaluation and evaluations per second. Target: 100 trucks
 * in 5 ms or less.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { evaluateCase } from '@/lib/engine';
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
      `   cpu ${cpuMs.toFixed(3).padStart(8)} ms/evaluation   (${samples.length} runs)`,
  );
  return { medianMs: m, cpuMs };
}

export async function run(): Promise<void> {
  const file = path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json');
  const base = JSON.parse(readFileSync(file, 'utf8')) as CaseFileInput;
  let hundred = 0;
  for (const size of [10, 100, 1000]) {
    const fleet = syntheticFleet(base, size);
    const validated = time(`evaluateCase, ${size} trucks`, () => evaluateCase(fleet));
    time(`  trusted (no validation)`, () => evaluateCase(fleet, { trusted: true }));
    if (size === 100) hundred = validated.medianMs;
  }
  console.log(`target: 100 trucks ≤ 5 ms warm → ${hundred <= 5 ? 'met' : 'NOT met'} (${hundred.toFixed(3)} ms)`);
}
