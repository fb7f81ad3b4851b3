/**
 * Runs a Monte Carlo spec's iterations across worker threads, each a
 * contiguous block, and joins their npvs back in iteration order. Shared by
 * the job manager and the benchmark (no server-only imports here).
 */
import { Worker } from 'node:worker_threads';
import type { MonteCarloSpec } from '@/lib/engine/monte-carlo';
import type { CaseFileInput } from '@/lib/validation/case';
import type { WorkerInput, WorkerMessage } from './worker-entry';

export interface PoolRun {
  workers: Worker[];
  /** npvs of the iterations done, in iteration order within each block, blocks in order */
  finished: Promise<{ npvs: Float64Array; done: number }>;
}

export function runInWorkers(
  bundle: string,
  validCase: CaseFileInput,
  spec: MonteCarloSpec,
  o: { workers: number; stop: SharedArrayBuffer; onProgress?: (done: number) => void },
): PoolRun {
  const total = spec.iterations;
  const count = Math.max(1, Math.min(o.workers, Math.ceil(total / 100)));
  const doneBy = new Array<number>(count).fill(0);
  const parts: (Float64Array | null)[] = new Array(count).fill(null);
  const progressEvery = Math.max(10, Math.min(250, Math.floor(total / count / 40)));
  const workers: Worker[] = [];
  const runs = Array.from({ length: count }, (_, w) => {
    const from = Math.floor((total * w) / count);
    const to = Math.floor((total * (w + 1)) / count);
    const data: WorkerInput = { validCase, spec, from, to, stop: o.stop, progressEvery };
    const worker = new Worker(bundle, { workerData: data });
    workers.push(worker);
    return new Promise<void>((resolve, reject) => {
      worker.on('message', (m: WorkerMessage) => {
        doneBy[w] = m.done;
        o.onProgress?.(doneBy.reduce((a, b) => a + b, 0));
        if (m.type === 'done') parts[w] = m.npvs;
      });
      // a missing bundle (npm run build:workers not run) also ends up here
      worker.on('error', (err) => reject(new Error(`Monte Carlo worker failed: ${err.message}`)));
      worker.on('exit', (code) => (parts[w] || code === 0 ? resolve() : reject(new Error(`worker stopped with code ${code}`))));
    });
  });
  const finished = Promise.all(runs).then(() => {
    const length = parts.reduce((a, p) => a + (p?.length ?? 0), 0);
    const npvs = new Float64Array(length);
    let at = 0;
    for (const p of parts) {
      if (!p) continue;
      npvs.set(p, at);
      at += p.length;
    }
    return { npvs, done: doneBy.reduce((a, b) => a + b, 0) };
  });
  finished.catch(() => workers.forEach((w) => void w.terminate()));
  return { workers, finished };
}
