/**
 * The Monte Carlo benchmark itself (bench/monte-carlo.ts bundles it and runs
 * it in a fresh Node process, as the server runs: plain node, no tsx loader,
 * no heap left by the other benchmarks).
 *
 * Monte Carlo of 10,000 iterations over a synthetic fleet of 100 trucks, with
 * failures sampled and three drivers drawn, in 2 worker threads (the path the
 * app takes), wall time from start to summaries, and the CPU time it took
 * (the machine is shared). Three starts:
 * - cold: threads started for this run (a server started with HAULCASE_MC_PREWARM=0);
 * - first run after start-up: the threads the server warms when it starts (instrumentation.ts);
 * - warm: the same threads again (every later run).
 * Target: 1.5 s or less.
 *
 * Then memory over 50 warm runs of the same size (`memoryOverRuns`): each
 * run's 24 MB result buffer used to stay alive in the workers for good.
 * Run with --expose-gc (bench/monte-carlo.ts does) so the main thread's
 * garbage is collected before each memory reading.
 */
import { readFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { validateCase } from '@/lib/engine';
import { runIterations, type MonteCarloSpec } from '@/lib/engine/monte-carlo';
import type { CaseFileInput } from '@/lib/validation/case';
import { drainPool, pooledBufferBytes, prewarm, recycledPools, runInWorkers, setRecycleIdleMs } from '@/lib/risk/pool';
import { syntheticFleet } from './synthetic-fleet';

const ITERATIONS = 10_000;
const TRUCKS = 100;

/** `root`: the project folder; `bundle`: the worker bundle, already built. */
async function main(root: string, bundle: string): Promise<void> {
  const base = JSON.parse(readFileSync(path.join(root, 'scenarios', 'aldervane-north-pit.json'), 'utf8'));
  const v = validateCase(syntheticFleet(base, TRUCKS));
  if (!v.ok) throw new Error('synthetic fleet is not a valid case');
  const spec: MonteCarloSpec = {
    iterations: ITERATIONS,
    seed: 12345,
    sampleFailures: true,
    distributions: [
      { driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.85, mode: 1.05, max: 1.4 } },
      { driver: 'discountRate', distribution: { kind: 'uniform', min: 0.06, max: 0.1 } },
      { driver: 'modulePrice@kestrel-km2700', distribution: { kind: 'normal', mean: 1650000, sd: 120000, min: 1400000, max: 1950000 } },
    ],
  };

  // in-process, one thread: the lean path's own speed
  runIterations(v.value, spec, 0, 50);
  const t1 = performance.now();
  runIterations(v.value, spec, 0, 500);
  const oneThread = (500 / (performance.now() - t1)) * 1000;
  console.log(`one thread, ${TRUCKS} trucks: ${oneThread.toFixed(0)} iterations/s (${(oneThread * TRUCKS).toFixed(0)} truck-iterations/s)`);

  const demo = validateCase(base);
  if (!demo.ok) throw new Error('demo case is not valid');

  await drainPool(bundle);
  const cold = await timedRun(bundle, v.value, spec, 'cold workers (started for this run)');
  await drainPool(bundle);
  const w0 = performance.now();
  await prewarm(bundle, demo.value, { workers: 2 }); // what the server does when it starts
  console.log(`start-up warm-up of 2 workers on the demo mine: ${((performance.now() - w0) / 1000).toFixed(2)} s (in the background)`);
  const first = await timedRun(bundle, v.value, spec, 'workers warmed at start-up (a user\'s first run)');
  const warm = await timedRun(bundle, v.value, spec, 'warm workers (every later run)');
  for (const [label, t] of [['cold workers', cold], ['first run after start-up', first], ['warm workers', warm]] as const) {
    console.log(`target: 10,000 × 100 in ≤ 1.5 s, ${label} → ${t <= 1500 ? 'met' : 'NOT met'} (${(t / 1000).toFixed(2)} s)`);
  }

  // the demo mine as the risk page runs it by default: 24 trucks, 2,000 iterations
  const d0 = performance.now();
  await runInWorkers(bundle, demo.value, { ...spec, iterations: 2000 }, { workers: 2, stop: new SharedArrayBuffer(4) }).finished;
  console.log(`demo mine, 2,000 iterations × ${demo.value.trucks.length} trucks in 2 warm workers: ${((performance.now() - d0) / 1000).toFixed(2)} s`);

  await memoryOverRuns(bundle, demo.value, v.value, spec, 50);
}

const MIB = 2 ** 20;

/** Resident memory of the whole process (workers included), the main thread's garbage collected first. */
function rss(): number {
  (globalThis as { gc?: () => void }).gc?.();
  return process.memoryUsage().rss;
}

/**
 * Resident memory of the process (workers included) over `runs` warm runs,
 * run as the server's jobs run them, then once the pool has been idle long
 * enough to be recycled (here 2 s; the server waits HAULCASE_MC_RECYCLE_MS,
 * 60 s by default). At rest: a pool freshly warmed as the server warms it at
 * start-up. Before the result buffers were pooled each run's 24 MB buffer
 * stayed alive in the workers: 50 runs held 1.2 GB more than one. Targets:
 * the peak no more than 4 result buffers above memory after the first run,
 * and memory after recycling within 24 MiB of its level at rest.
 */
async function memoryOverRuns(bundle: string, demo: CaseFileInput, c: CaseFileInput, spec: MonteCarloSpec, runs: number): Promise<void> {
  await drainPool(bundle);
  await prewarm(bundle, demo, { workers: 2 });
  const resting = rss();
  setRecycleIdleMs(2000);
  let afterFirst = 0;
  let peak = 0;
  for (let i = 1; i <= runs; i++) {
    await runInWorkers(bundle, c, spec, { workers: 2, stop: new SharedArrayBuffer(4), keepNpvs: false }).finished;
    const now = rss();
    if (i === 1) afterFirst = now;
    peak = Math.max(peak, now);
  }
  const after = rss();
  const recycled = recycledPools();
  const t0 = performance.now();
  while (recycledPools() === recycled && performance.now() - t0 < 30_000) await new Promise((r) => setTimeout(r, 100));
  const idle = rss();
  const buffer = c.trucks.length * 3 * 8 * spec.iterations;
  const mib = (b: number) => `${(b / MIB).toFixed(0)} MiB`;
  console.log(
    `memory over ${runs} runs of ${spec.iterations.toLocaleString('en-US')} × ${c.trucks.length}: at rest (2 warm workers) ${mib(resting)}, after run 1 ${mib(afterFirst)}, ` +
      `peak ${mib(peak)}, after run ${runs} ${mib(after)}, once the idle pool is recycled ${mib(idle)} ` +
      `(free buffers ${mib(pooledBufferBytes())}; recycled after ${((performance.now() - t0) / 1000).toFixed(1)} s); load average ${os.loadavg()[0].toFixed(2)}`,
  );
  console.log(
    `target: peak within 4 result buffers (${mib(4 * buffer)}) of after run 1 → ${peak - afterFirst <= 4 * buffer ? 'met' : 'NOT met'} ` +
      `(${mib(peak - afterFirst)}; without pooling it would be ${mib((runs - 1) * buffer)})`,
  );
  console.log(
    `target: memory back to its resting level once idle (within 24 MiB) → ${idle - resting <= 24 * MIB ? 'met' : 'NOT met'} (${idle >= resting ? '+' : ''}${mib(idle - resting)})`,
  );
}

/** One run in 2 workers, start to summaries; prints wall and CPU time and returns the wall ms. */
async function timedRun(bundle: string, c: CaseFileInput, spec: MonteCarloSpec, label: string): Promise<number> {
  const cpu0 = process.cpuUsage(); // all threads of the process: the workers' work too
  const t0 = performance.now();
  let ran = 0;
  const pool = runInWorkers(bundle, c, spec, {
    workers: 2,
    stop: new SharedArrayBuffer(4),
    onProgress: (d) => {
      if (d === spec.iterations && !ran) ran = performance.now();
    },
  });
  const { done, result } = await pool.finished;
  const total = performance.now() - t0;
  const cpu = process.cpuUsage(cpu0);
  const cpuSeconds = (cpu.user + cpu.system) / 1e6;
  console.log(
    `2 ${label}, ${done.toLocaleString('en-US')} iterations × ${c.trucks.length} trucks: ${(total / 1000).toFixed(2)} s ` +
      `(iterations ${((ran - t0) / 1000).toFixed(2)} s, summaries ${((total - (ran - t0)) / 1000).toFixed(2)} s), ` +
      `${((done / total) * 1000).toFixed(0)} iterations/s; fleet ΔNPV P50 ${Math.round(result!.fleet.deltaNpv.p50).toLocaleString('en-US')}`,
  );
  // other work on the machine shows as fewer cores busy than 2: then the wall time is not the code's alone
  console.log(
    `  CPU ${cpuSeconds.toFixed(2)} s (${((cpuSeconds * 1000) / total).toFixed(2)} cores busy), ` +
      `${(done / cpuSeconds).toFixed(0)} iterations per CPU-second; load average ${os.loadavg()[0].toFixed(2)}`,
  );
  return total;
}

main(process.argv[2], process.argv[3]).then(
  () => process.exit(0),
  (err: unknown) => {
    console.error(err);
    process.exit(1);
  },
);
