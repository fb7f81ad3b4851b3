/**
 * The worker pool: iterations written by two workers into one shared buffer,
 * and the summaries they make side by side, are the numbers the same spec
 * gives in one thread (runIterations + summariseRun); a stopped run keeps, in
 * order, the iterations each worker finished; warm workers are reused and
 * give the same numbers again.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { validateCase } from '@/lib/engine';
import { runIterations, summariseRun, type MonteCarloSpec } from '@/lib/engine/monte-carlo';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { runInWorkers } from '@/lib/risk/pool';

const raw = JSON.parse(readFileSync(path.resolve(__dirname, '../../../scenarios/aldervane-north-pit.json'), 'utf8'));
const v = validateCase(raw);
if (!v.ok) throw new Error('demo case invalid');
const demo = v.value;
const ids = demo.trucks.map((t) => t.id);

const spec: MonteCarloSpec = {
  iterations: 301,
  seed: 99,
  sampleFailures: true,
  distributions: [
    { driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.85, mode: 1.05, max: 1.4 } },
    { driver: 'annualHours@*', distribution: { kind: 'uniform', min: 5200, max: 6600 } },
  ],
};

let bundle = '';
beforeAll(async () => {
  bundle = await buildMonteCarloWorker();
}, 60_000);

describe('runInWorkers', () => {
  it('gives the single-thread npvs and summaries exactly, run after run on the same warm workers', async () => {
    const inProcess = runIterations(demo, spec, 0, spec.iterations);
    const expected = summariseRun(ids, inProcess.npvs);
    for (let round = 0; round < 2; round++) {
      const progress: number[] = [];
      const pool = runInWorkers(bundle, demo, spec, { workers: 2, stop: new SharedArrayBuffer(4), onProgress: (d) => progress.push(d) });
      const { npvs, done, result } = await pool.finished;
      expect(done).toBe(spec.iterations);
      expect(Array.from(npvs)).toEqual(Array.from(inProcess.npvs));
      expect(result).toEqual(expected);
      expect(progress.at(-1)).toBe(spec.iterations);
    }
  });

  it('keeps, in order, what each worker finished when the run is stopped', async () => {
    const stop = new SharedArrayBuffer(4);
    Atomics.store(new Int32Array(stop), 0, 1); // stop at the first check: each worker does one progress step
    const { npvs, done, result } = await runInWorkers(bundle, demo, { ...spec, iterations: 4000 }, { workers: 2, stop }).finished;
    expect(done).toBeGreaterThan(0);
    expect(done).toBeLessThan(4000);
    const half = done / 2; // both workers stopped after the same number of iterations
    const first = runIterations(demo, spec, 0, half).npvs;
    const second = runIterations(demo, spec, 2000, 2000 + half).npvs;
    expect(Array.from(npvs)).toEqual([...first, ...second]);
    expect(result).toEqual(summariseRun(ids, Float64Array.from([...first, ...second])));
    expect(result!.iterations).toBe(done);
  });
});
