/**
 * Monte Carlo of 10,000 iterations over a synthetic fleet of 100 trucks, with
 * failures sampled and three drivers drawn, in 2 worker threads (the path the
 * app takes), wall time from start to summaries. Target: 1.5 s or less.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { validateCase } from '@/lib/engine';
import { runIterations, summariseRun, type MonteCarloSpec } from '@/lib/engine/monte-carlo';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { runInWorkers } from '@/lib/risk/pool';
import { syntheticFleet } from './support/synthetic-fleet';

const ITERATIONS = 10_000;
const TRUCKS = 100;

export async function run(): Promise<void> {
  const base = JSON.parse(readFileSync(path.resolve(__dirname, '..', 'scenarios', 'aldervane-north-pit.json'), 'utf8'));
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

  const bundle = await buildMonteCarloWorker();
  const t0 = performance.now();
  const pool = runInWorkers(bundle, v.value, spec, { workers: 2, stop: new SharedArrayBuffer(4) });
  const { npvs, done } = await pool.finished;
  const ran = performance.now();
  const result = summariseRun(v.value.trucks.map((t) => t.id), npvs);
  const total = performance.now() - t0;
  console.log(
    `2 workers, ${done.toLocaleString('en-US')} iterations × ${TRUCKS} trucks: ${(total / 1000).toFixed(2)} s ` +
      `(iterations ${((ran - t0) / 1000).toFixed(2)} s, summaries ${((total - (ran - t0)) / 1000).toFixed(2)} s), ` +
      `${((done / total) * 1000).toFixed(0)} iterations/s; fleet ΔNPV P50 ${Math.round(result.fleet.deltaNpv.p50).toLocaleString('en-US')}`,
  );
  console.log(`target: 10,000 × 100 in ≤ 1.5 s → ${total <= 1500 ? 'met' : 'NOT met'} (${(total / 1000).toFixed(2)} s)`);

  // the demo mine as the risk page runs it by default: 24 trucks, 2,000 iterations
  const demo = validateCase(base);
  if (!demo.ok) throw new Error('demo case is not valid');
  const d0 = performance.now();
  const demoRun = await runInWorkers(bundle, demo.value, { ...spec, iterations: 2000 }, { workers: 2, stop: new SharedArrayBuffer(4) }).finished;
  summariseRun(demo.value.trucks.map((t) => t.id), demoRun.npvs);
  console.log(`demo mine, 2,000 iterations × ${demo.value.trucks.length} trucks in 2 workers: ${((performance.now() - d0) / 1000).toFixed(2)} s`);
}
