/**
 * Runs a Monte Carlo spec's iterations across worker threads, which take
 * chunks of iterations from a shared counter and write each straight into its
 * place in one shared buffer (no copies, no merge), then has the same workers
 * summarise blocks of trucks side by side.
 * Shared by the job manager and the benchmark (no server-only imports here).
 *
 * Workers outlive a run: finished ones wait, unreferenced, for the next run
 * (a fresh worker spends its first iterations in the interpreter while the
 * optimiser catches up, which is most of a short run's time). A worker that
 * fails is terminated, never reused.
 *
 * The shared result buffers outlive a run too, and are reused (`leaseBuffer`):
 * an idle worker's heap keeps every SharedArrayBuffer it was ever sent until
 * that thread next collects garbage, which an allocation-free worker hardly
 * ever does, so a new buffer per run kept every run's 24 MB (10,000 × 100
 * trucks) alive for good. A run copies the npvs it reports out of its buffer.
 *
 * What a warm worker's heap gains over many runs (V8 collects an idle thread
 * lazily) and the free buffers are given back once the pool has been idle
 * for a while (`HAULCASE_MC_RECYCLE_MS`, 60 s by default; 0 = never): the idle
 * workers are ended, the free buffers dropped, and, where the server warmed
 * the pool at start-up, fresh workers are warmed the same way, so memory
 * returns to its level after start-up and the next run still finds warm workers.
 */
import { Worker } from 'node:worker_threads';
import type { MonteCarloResult, MonteCarloSpec, TruckRisk } from '@/lib/engine/monte-carlo';
import { env } from '@/lib/env';
import type { CaseFileInput } from '@/lib/validation/case';
import type { DoneRange, WorkerMessage, WorkerRequest } from './worker-entry';

export interface PoolRun {
  workers: Worker[];
  /**
   * npvs of the iterations done, in iteration order (empty with `keepNpvs: false`); which ones they are
   * (all of them unless the run was stopped); their summaries (null when none ran)
   */
  finished: Promise<{ npvs: Float64Array; done: number; ranges: DoneRange[]; result: MonteCarloResult | null }>;
}

/**
 * Iterations a worker takes at a time: about fifty chunks per worker, so the
 * last one to finish waits for at most a small share of the run, and at least
 * one progress step each.
 */
export function chunkSize(total: number, workers: number, progressEvery: number): number {
  return Math.max(progressEvery, Math.ceil(total / (workers * 50)));
}

/** Idle workers kept per bundle, at most this many (two runs at once of two workers each). */
const MAX_IDLE = 4;
// on globalThis, like the job registry, so a hot reload in development does not strand warm workers
const holder = globalThis as unknown as { __haulcaseMcIdle?: Map<string, Worker[]> };
const idle = (holder.__haulcaseMcIdle ??= new Map<string, Worker[]>());

function takeWorker(bundle: string): Worker {
  const list = idle.get(bundle) ?? [];
  let w = list.pop();
  while (w && w.threadId < 0) w = list.pop(); // exited while idle
  if (w) {
    w.ref();
    return w;
  }
  const fresh = new Worker(bundle);
  fresh.on('exit', () => {
    const l = idle.get(bundle);
    const at = l ? l.indexOf(fresh) : -1;
    if (l && at >= 0) l.splice(at, 1);
  });
  return fresh;
}

function giveBack(bundle: string, workers: Worker[]): void {
  const list = idle.get(bundle) ?? [];
  idle.set(bundle, list);
  for (const w of workers) {
    if (list.length >= MAX_IDLE) {
      void w.terminate();
      continue;
    }
    w.unref(); // an idle worker must not keep the process alive
    list.push(w);
  }
}

/** Send one request and wait for its answer (progress messages go to onProgress). */
function ask(worker: Worker, request: WorkerRequest, onProgress?: (done: number) => void): Promise<WorkerMessage> {
  return new Promise((resolve, reject) => {
    const cleanup = () => {
      worker.off('message', onMessage);
      worker.off('error', onError);
      worker.off('exit', onExit);
    };
    const onMessage = (m: WorkerMessage) => {
      if (m.type === 'progress') {
        onProgress?.(m.done);
        return;
      }
      cleanup();
      resolve(m);
    };
    // a missing bundle (npm run build:workers not run) also ends up here
    const onError = (err: Error) => {
      cleanup();
      reject(new Error(`Monte Carlo worker failed: ${err.message}`));
    };
    const onExit = (code: number) => {
      cleanup();
      reject(new Error(`worker stopped with code ${code}`));
    };
    worker.on('message', onMessage);
    worker.on('error', onError);
    worker.on('exit', onExit);
    worker.postMessage(request);
  });
}

/** The warm-up in progress, if any: a real run stops it and waits for its workers (on globalThis, like the idle list:
 * the server's start-up hook and its route handlers may load separate copies of this module). */
const warmHolder = globalThis as unknown as { __haulcaseMcWarming?: { stop: Int32Array; finished: Promise<unknown> } | null };

/**
 * Start `workers` threads before anyone asks for a run and run a short
 * Monte Carlo of `validCase` on them (sampled failures and a few drivers of
 * each kind), so the first real run finds them compiled and optimised: a fresh
 * worker spends its first half second in the interpreter and the compiler.
 * The numbers are thrown away. A run that starts meanwhile stops the warm-up
 * at its next progress step and takes its workers. Resolves when done.
 */
export function prewarm(bundle: string, validCase: CaseFileInput, o: { workers: number; iterations?: number }): Promise<void> {
  const offer = validCase.repowerOffers[0];
  const spec: MonteCarloSpec = {
    iterations: o.iterations ?? 600,
    seed: 1,
    sampleFailures: true,
    distributions: [
      { driver: 'fuelPrice', distribution: { kind: 'triangular', min: 0.8, mode: 1, max: 1.3 } },
      { driver: 'discountRate', distribution: { kind: 'uniform', min: 0.05, max: 0.1 } },
      { driver: 'annualHours@*', distribution: { kind: 'uniform', min: 5000, max: 6500 } },
      ...(offer ? [{ driver: `modulePrice@${offer.id}`, distribution: { kind: 'normal' as const, mean: offer.modulePrice, sd: offer.modulePrice / 10, min: 0, max: 2 * offer.modulePrice } }] : []),
    ],
  };
  recycle.recipes.set(bundle, { validCase, workers: o.workers, iterations: o.iterations });
  const stop = new SharedArrayBuffer(4);
  const run = runInWorkers(bundle, validCase, spec, { workers: o.workers, stop, warmUp: true, keepNpvs: false });
  const finished = run.finished.then(
    () => undefined,
    () => undefined, // a failed warm-up only means the first run starts cold
  );
  const entry = { stop: new Int32Array(stop), finished };
  warmHolder.__haulcaseMcWarming = entry;
  void finished.then(() => {
    if (warmHolder.__haulcaseMcWarming === entry) warmHolder.__haulcaseMcWarming = null;
  });
  return finished;
}

/** Stop the warm-up, if one is running, and wait until its workers are back in the pool. */
function stopWarmUp(): Promise<unknown> {
  const warming = warmHolder.__haulcaseMcWarming;
  if (!warming) return Promise.resolve();
  Atomics.store(warming.stop, 0, 1);
  return warming.finished;
}

interface Recycling {
  /** idle time after the last real run before the pool is recycled; 0: never */
  idleMs: number;
  /** real runs (not warm-ups) in progress, per bundle */
  active: Map<string, number>;
  timers: Map<string, ReturnType<typeof setTimeout>>;
  /** how each bundle was warmed at start-up, to warm its fresh workers the same way */
  recipes: Map<string, { validCase: CaseFileInput; workers: number; iterations?: number }>;
  /** pools recycled so far (the benchmark and tests wait on it) */
  count: number;
}
const recycleHolder = globalThis as unknown as { __haulcaseMcRecycle?: Recycling };
const recycle = (recycleHolder.__haulcaseMcRecycle ??= {
  idleMs: env().HAULCASE_MC_RECYCLE_MS,
  active: new Map(),
  timers: new Map(),
  recipes: new Map(),
  count: 0,
});

/** Set how long the pool may sit idle before it is recycled (0: never); the benchmark and tests. */
export function setRecycleIdleMs(ms: number): void {
  recycle.idleMs = ms;
}

/** Pools recycled since the process started. */
export function recycledPools(): number {
  return recycle.count;
}

function runStarted(bundle: string): void {
  const t = recycle.timers.get(bundle);
  if (t) clearTimeout(t);
  recycle.timers.delete(bundle);
  recycle.active.set(bundle, (recycle.active.get(bundle) ?? 0) + 1);
}

function runEnded(bundle: string): void {
  const left = (recycle.active.get(bundle) ?? 1) - 1;
  recycle.active.set(bundle, left);
  if (left > 0 || !(recycle.idleMs > 0)) return;
  const timer = setTimeout(() => {
    recycle.timers.delete(bundle);
    if ((recycle.active.get(bundle) ?? 0) === 0) void recyclePool(bundle);
  }, recycle.idleMs);
  timer.unref(); // an idle pool must not keep the process alive
  recycle.timers.set(bundle, timer);
}

/**
 * End the idle workers of a bundle and drop the free buffers, then warm fresh
 * workers as at start-up (when the pool was warmed then). Memory returns to
 * its level after start-up; a run that starts meanwhile stops the warm-up.
 */
export async function recyclePool(bundle: string): Promise<void> {
  await drainPool(bundle);
  const recipe = recycle.recipes.get(bundle);
  if (recipe && (recycle.active.get(bundle) ?? 0) === 0) await prewarm(bundle, recipe.validCase, recipe);
  recycle.count++;
}

/** End every idle worker of a bundle and drop the free result buffers (the benchmark's cold start; tests). */
export async function drainPool(bundle: string): Promise<void> {
  await stopWarmUp();
  freeBuffers.length = 0;
  const list = idle.get(bundle) ?? [];
  idle.set(bundle, []);
  await Promise.all(list.map((w) => w.terminate()));
}

/** Free result buffers, reused largest-first by later runs; at most this many are kept. */
const MAX_FREE_BUFFERS = 2;
const bufferHolder = globalThis as unknown as { __haulcaseMcBuffers?: SharedArrayBuffer[] };
const freeBuffers = (bufferHolder.__haulcaseMcBuffers ??= []);

/**
 * A shared buffer of at least `bytes` for one run: the smallest free one that
 * is large enough, else a new one (rounded up to a power of two, at least
 * 1 MiB, so a fleet that grows a little does not need another), dropping the
 * smallest free one when the pool is full. Give it back with `releaseBuffer`
 * once no worker writes or reads it any more.
 */
export function leaseBuffer(bytes: number): SharedArrayBuffer {
  let best = -1;
  for (let i = 0; i < freeBuffers.length; i++) {
    const size = freeBuffers[i].byteLength;
    if (size >= bytes && (best < 0 || size < freeBuffers[best].byteLength)) best = i;
  }
  if (best >= 0) return freeBuffers.splice(best, 1)[0];
  if (freeBuffers.length >= MAX_FREE_BUFFERS) {
    freeBuffers.sort((a, b) => a.byteLength - b.byteLength);
    freeBuffers.shift();
  }
  return new SharedArrayBuffer(Math.max(2 ** 20, 2 ** Math.ceil(Math.log2(Math.max(1, bytes)))));
}

export function releaseBuffer(buffer: SharedArrayBuffer): void {
  if (!freeBuffers.includes(buffer)) freeBuffers.push(buffer);
}

/** Bytes held by free result buffers (the memory benchmark and tests). */
export function pooledBufferBytes(): number {
  return freeBuffers.reduce((n, b) => n + b.byteLength, 0);
}

export function runInWorkers(
  bundle: string,
  validCase: CaseFileInput,
  spec: MonteCarloSpec,
  o: {
    workers: number;
    stop: SharedArrayBuffer;
    onProgress?: (done: number) => void;
    warmUp?: boolean;
    /** false: report no npvs (an empty array), only the summaries — the server's runs, which need no copy of 24 MB */
    keepNpvs?: boolean;
  },
): PoolRun {
  const total = spec.iterations;
  const trucks = validCase.trucks.length;
  const truckIds = validCase.trucks.map((t) => t.id);
  const count = Math.max(1, Math.min(o.workers, Math.ceil(total / 100)));
  const perIteration = trucks * 3;
  const out = leaseBuffer(total * perIteration * 8);
  const next = new SharedArrayBuffer(4);
  const doneBy = new Array<number>(count).fill(0);
  const rangesBy: DoneRange[][] = Array.from({ length: count }, () => []);
  const progressEvery = Math.max(10, Math.min(250, Math.floor(total / count / 40)));
  const chunk = chunkSize(total, count, progressEvery);
  // filled once the workers are taken (after any warm-up has handed its workers back)
  const workers: Worker[] = [];
  const ready = o.warmUp ? Promise.resolve() : stopWarmUp();
  if (!o.warmUp) runStarted(bundle);

  const runs = ready.then(() => {
    for (let w = 0; w < count; w++) workers.push(takeWorker(bundle));
    return Promise.all(
      workers.map((worker, w) =>
        ask(worker, { type: 'run', validCase, spec, next, chunk, stop: o.stop, out, progressEvery }, (done) => {
          doneBy[w] = done;
          o.onProgress?.(doneBy.reduce((a, b) => a + b, 0));
        }).then((m) => {
          if (m.type === 'done') {
            doneBy[w] = m.done;
            rangesBy[w] = m.ranges;
          }
        }),
      ),
    );
  });

  const finished = runs.then(async () => {
    const done = doneBy.reduce((a, b) => a + b, 0);
    o.onProgress?.(done);
    const all = new Float64Array(out, 0, total * perIteration);
    // in iteration order; a stopped run leaves gaps: move each range's finished iterations up behind the previous one
    const ranges = rangesBy.flat().filter(([, n]) => n > 0).sort((x, y) => x[0] - y[0]);
    let at = 0;
    for (const [from, n] of ranges) {
      const start = from * perIteration;
      if (start !== at) all.copyWithin(at, start, start + n * perIteration);
      at += n * perIteration;
    }
    // a copy: the buffer goes back to the pool for the next run
    const npvs = o.keepNpvs === false ? new Float64Array(0) : all.slice(0, at);
    let result: MonteCarloResult | null = null;
    if (done > 0) {
      const parts = await Promise.all(
        workers.map((worker, w) =>
          ask(worker, {
            type: 'summarise', truckIds, npvs: out, length: at,
            trucksFrom: Math.floor((trucks * w) / count), trucksTo: Math.floor((trucks * (w + 1)) / count), fleet: w === 0,
            proposal: spec.proposal ?? null,
          }),
        ),
      );
      const truckRisk: TruckRisk[] = [];
      let fleet: MonteCarloResult['fleet'] | null = null;
      for (const m of parts) {
        if (m.type !== 'summary') continue;
        truckRisk.push(...m.trucks);
        fleet = m.fleet ?? fleet;
      }
      result = { iterations: done, trucks: truckRisk, fleet: fleet as MonteCarloResult['fleet'] };
    }
    giveBack(bundle, workers);
    releaseBuffer(out);
    return { npvs, done, ranges, result };
  });
  finished.catch(() => {
    // terminated workers write nothing more: the buffer can serve another run
    void Promise.all(workers.map((w) => w.terminate())).then(() => releaseBuffer(out));
  });
  if (!o.warmUp) {
    finished.then(
      () => runEnded(bundle),
      () => runEnded(bundle),
    );
  }
  return { workers, finished };
}
