/**
 * The worker pool: iterations written by two workers into one shared buffer,
 * and the summaries they make side by side, are the numbers the same spec
 * gives in one thread (runIterations + summariseRun), however the workers
 * shared the chunks out; a stopped run keeps, in iteration order, the
 * iterations the workers finished; warm workers are reused and give the same
 * numbers again.
 */
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { validateCase } from '@/lib/engine';
import { runIterations, summariseRun, type MonteCarloSpec } from '@/lib/engine/monte-carlo';
import { buildMonteCarloWorker } from '@/lib/risk/build-worker';
import { chunkSize, drainPool, leaseBuffer, pooledBufferBytes, prewarm, recycledPools, releaseBuffer, runInWorkers, setRecycleIdleMs } from '@/lib/risk/pool';

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

  it('adds the proposal\'s figure (its policies fixed) exactly as one thread sums it', async () => {
    const proposal = Object.fromEntries(ids.map((id, i) => [id, i % 3 === 0 ? 'repower' : i % 3 === 1 ? 'keep' : 'rebuild'] as const));
    const withProposal: MonteCarloSpec = { ...spec, iterations: 120, proposal };
    const inProcess = runIterations(demo, withProposal, 0, withProposal.iterations);
    const { result } = await runInWorkers(bundle, demo, withProposal, { workers: 2, stop: new SharedArrayBuffer(4) }).finished;
    expect(result!.fleet.proposalNpv).toBeDefined();
    expect(result).toEqual(summariseRun(ids, inProcess.npvs, proposal));
  });

  it('keeps, in iteration order, what the workers finished when the run is stopped', async () => {
    const stop = new SharedArrayBuffer(4);
    const flag = new Int32Array(stop);
    // raised at the first progress step: each worker stops at its next check, within its first chunk
    const { npvs, done, ranges, result } = await runInWorkers(bundle, demo, { ...spec, iterations: 4000 }, {
      workers: 2,
      stop,
      onProgress: () => Atomics.store(flag, 0, 1),
    }).finished;
    expect(done).toBeGreaterThan(0);
    expect(done).toBeLessThan(4000);
    expect(ranges.reduce((sum, [, n]) => sum + n, 0)).toBe(done);
    // the ranges are in order and do not overlap; their npvs are the single-thread ones for those iterations
    const expected: number[] = [];
    let end = 0;
    for (const [from, n] of ranges) {
      expect(from).toBeGreaterThanOrEqual(end);
      end = from + n;
      expected.push(...runIterations(demo, spec, from, from + n).npvs);
    }
    expect(Array.from(npvs)).toEqual(expected);
    expect(result).toEqual(summariseRun(ids, Float64Array.from(expected)));
    expect(result!.iterations).toBe(done);
  });

  it('a run started while the workers warm up stops the warm-up, takes its workers and gives the single-thread numbers', async () => {
    await drainPool(bundle);
    let warmed = false;
    const warming = prewarm(bundle, demo, { workers: 2, iterations: 200_000 }).then(() => (warmed = true));
    await new Promise((r) => setTimeout(r, 300)); // the warm-up is under way
    expect(warmed).toBe(false);
    const { npvs, done } = await runInWorkers(bundle, demo, spec, { workers: 2, stop: new SharedArrayBuffer(4) }).finished;
    // the run waited for the warm-up to hand its workers back, so the warm-up has ended (far short of 200,000 iterations)
    expect(warmed).toBe(true);
    await warming;
    expect(done).toBe(spec.iterations);
    expect(Array.from(npvs)).toEqual(Array.from(runIterations(demo, spec, 0, spec.iterations).npvs));
  });

  it('reuses one result buffer run after run (the workers kept every run\'s buffer alive when each had its own), and stale numbers in it never reach a result', async () => {
    // a large run first, so the smaller ones after it reuse a buffer holding its numbers
    const big = { ...spec, iterations: 3000, seed: 7 };
    await runInWorkers(bundle, demo, big, { workers: 2, stop: new SharedArrayBuffer(4) }).finished;
    const held = pooledBufferBytes();
    expect(held).toBeGreaterThanOrEqual(3000 * demo.trucks.length * 3 * 8);
    for (let round = 0; round < 3; round++) {
      const { npvs } = await runInWorkers(bundle, demo, spec, { workers: 2, stop: new SharedArrayBuffer(4) }).finished;
      expect(Array.from(npvs)).toEqual(Array.from(runIterations(demo, spec, 0, spec.iterations).npvs));
      expect(pooledBufferBytes()).toBe(held);
    }
  });

  it('leases the smallest free buffer that is large enough, grows by powers of two and keeps at most two free', async () => {
    await drainPool(bundle);
    expect(pooledBufferBytes()).toBe(0);
    const a = leaseBuffer(3 * 2 ** 20);
    expect(a.byteLength).toBe(4 * 2 ** 20);
    releaseBuffer(a);
    expect(leaseBuffer(2 ** 20 + 1)).toBe(a); // reused, not a new one
    const b = leaseBuffer(10);
    expect(b.byteLength).toBe(2 ** 20); // at least 1 MiB
    const c = leaseBuffer(9 * 2 ** 20);
    for (const x of [a, b, c]) releaseBuffer(x);
    // three given back, but the pool keeps every one until a new buffer is needed; then the smallest goes
    expect(pooledBufferBytes()).toBe((4 + 1 + 16) * 2 ** 20);
    const d = leaseBuffer(20 * 2 ** 20);
    expect(d.byteLength).toBe(32 * 2 ** 20);
    expect(pooledBufferBytes()).toBe((4 + 16) * 2 ** 20); // b (1 MiB) dropped
    releaseBuffer(d);
    expect(leaseBuffer(2 ** 20)).toBe(a);
  });

  it('once idle, ends its workers and drops its free buffers, warms fresh workers as at start-up, and gives the same numbers after', async () => {
    await drainPool(bundle);
    await prewarm(bundle, demo, { workers: 2, iterations: 200 }); // as the server does at start-up: the recipe for later
    const big = { ...spec, iterations: 3000, seed: 7 };
    setRecycleIdleMs(50);
    try {
      const recycled = recycledPools();
      const first = runInWorkers(bundle, demo, big, { workers: 2, stop: new SharedArrayBuffer(4) });
      const before = await first.finished;
      const oldThreads = first.workers.map((w) => w.threadId);
      expect(pooledBufferBytes()).toBeGreaterThanOrEqual(3000 * demo.trucks.length * 3 * 8);
      for (let waited = 0; recycledPools() === recycled && waited < 20_000; waited += 25) await new Promise((r) => setTimeout(r, 25));
      expect(recycledPools()).toBe(recycled + 1);
      // the big run's buffer is gone; what is left is the fresh warm-up's own small one
      expect(pooledBufferBytes()).toBeLessThan(3000 * demo.trucks.length * 3 * 8);
      const again = runInWorkers(bundle, demo, big, { workers: 2, stop: new SharedArrayBuffer(4) });
      const after = await again.finished;
      expect(again.workers.map((w) => w.threadId).some((id) => oldThreads.includes(id))).toBe(false);
      expect(Array.from(after.npvs)).toEqual(Array.from(before.npvs));
      expect(after.result).toEqual(before.result);
    } finally {
      setRecycleIdleMs(0);
    }
  });

  it('shares the iterations out in chunks of about a fiftieth of each worker\'s share, and never less than a progress step', () => {
    expect(chunkSize(10_000, 2, 125)).toBe(125);
    expect(chunkSize(100_000, 2, 250)).toBe(1000);
    expect(chunkSize(300, 2, 10)).toBe(10);
  });
});
