/**
 * Entry of a Monte Carlo worker thread (bundled by scripts/build-workers.ts
 * into .haulcase/mc-worker.cjs, so Next's server bundle never has to resolve it).
 * It runs iterations [from, to) of a job, posts progress, and stops early when
 * the job manager raises the shared stop flag (cancel or time limit), returning
 * the iterations it finished.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { runIterations, type MonteCarloSpec } from '@/lib/engine/monte-carlo';
import type { CaseFileInput } from '@/lib/validation/case';

export interface WorkerInput {
  validCase: CaseFileInput;
  spec: MonteCarloSpec;
  from: number;
  to: number;
  /** Int32Array over a SharedArrayBuffer: [0] != 0 means stop */
  stop: SharedArrayBuffer;
  progressEvery: number;
}

export type WorkerMessage = { type: 'progress'; done: number } | { type: 'done'; done: number; npvs: Float64Array };

const input = workerData as WorkerInput;
const stop = new Int32Array(input.stop);
const { npvs, done } = runIterations(input.validCase, input.spec, input.from, input.to, {
  every: input.progressEvery,
  onProgress: (n) => parentPort?.postMessage({ type: 'progress', done: n } satisfies WorkerMessage),
  shouldStop: () => Atomics.load(stop, 0) !== 0,
});
parentPort?.postMessage({ type: 'done', done, npvs } satisfies WorkerMessage, [npvs.buffer as ArrayBuffer]);
