/**
 * Entry of a Monte Carlo worker thread (bundled by scripts/build-workers.ts
 * into .haulcase/mc-worker.cjs, so Next's server bundle never has to resolve it).
 *
 * A worker lives across runs (lib/risk/pool.ts keeps it warm: a fresh one
 * spends its first iterations in the interpreter) and answers two requests:
 * - run: iterations [from, to) of a job, written straight into the job's
 *   shared npvs buffer at its block, with progress, stopping early when the
 *   shared stop flag is raised (cancel or time limit);
 * - summarise: the risk figures of a block of trucks (and, for one worker, the
 *   fleet) from the whole run in that shared buffer, so the summaries run side
 *   by side and off the request thread.
 */
import { parentPort } from 'node:worker_threads';
import { runIterations, summariseFleet, summariseTrucks, type MonteCarloResult, type MonteCarloSpec, type TruckRisk } from '@/lib/engine/monte-carlo';
import type { CaseFileInput } from '@/lib/validation/case';

export interface RunRequest {
  type: 'run';
  validCase: CaseFileInput;
  spec: MonteCarloSpec;
  from: number;
  to: number;
  /** Int32Array over a SharedArrayBuffer: [0] != 0 means stop */
  stop: SharedArrayBuffer;
  /** Float64 npvs of the whole job; this worker writes from double `offset` on */
  out: SharedArrayBuffer;
  offset: number;
  progressEvery: number;
}

export interface SummariseRequest {
  type: 'summarise';
  truckIds: string[];
  /** the run's npvs, iteration after iteration, in the first `length` doubles */
  npvs: SharedArrayBuffer;
  length: number;
  trucksFrom: number;
  trucksTo: number;
  fleet: boolean;
}

export type WorkerRequest = RunRequest | SummariseRequest;

export type WorkerMessage =
  | { type: 'progress'; done: number }
  | { type: 'done'; done: number }
  | { type: 'summary'; trucks: TruckRisk[]; fleet: MonteCarloResult['fleet'] | null };

function handle(m: WorkerRequest): WorkerMessage {
  if (m.type === 'run') {
    const stop = new Int32Array(m.stop);
    const trucks = m.validCase.trucks.length;
    const into = new Float64Array(m.out, m.offset * 8, (m.to - m.from) * trucks * 3);
    const { done } = runIterations(m.validCase, m.spec, m.from, m.to, {
      every: m.progressEvery,
      onProgress: (n) => parentPort?.postMessage({ type: 'progress', done: n } satisfies WorkerMessage),
      shouldStop: () => Atomics.load(stop, 0) !== 0,
      into,
    });
    return { type: 'done', done };
  }
  const npvs = new Float64Array(m.npvs, 0, m.length);
  return {
    type: 'summary',
    trucks: summariseTrucks(m.truckIds, npvs, m.trucksFrom, m.trucksTo),
    fleet: m.fleet ? summariseFleet(m.truckIds.length, npvs) : null,
  };
}

// errors are thrown out of the handler: the thread then exits with an 'error' event the pool reports
parentPort?.on('message', (m: WorkerRequest) => parentPort?.postMessage(handle(m)));
