/**
 * Entry of a Monte Carlo worker thread (bundled by scripts/build-workers.ts
 * into .haulcase/mc-worker.cjs, so Next's server bundle never has to resolve it).
 *
 * A worker lives across runs (lib/risk/pool.ts keeps it warm: a fresh one
 * spends its first iterations in the interpreter) and answers two requests:
 * - run: a job's iterations, taken a chunk at a time from a shared counter
 *   (so a worker slowed by other work on the machine takes fewer chunks and
 *   both finish together), each written straight into the job's shared npvs
 *   buffer at its own place, with progress, stopping early when the shared
 *   stop flag is raised (cancel or time limit);
 * - summarise: the risk figures of a block of trucks (and, for one worker, the
 *   fleet) from the whole run in that shared buffer, so the summaries run side
 *   by side and off the request thread.
 */
import { parentPort } from 'node:worker_threads';
import { IterationRunner, proposalSlots, summariseFleet, type RunControl, summariseTrucks, type MonteCarloResult, type MonteCarloSpec, type TruckRisk } from '@/lib/engine/monte-carlo';
import type { CaseFileInput } from '@/lib/validation/case';

export interface RunRequest {
  type: 'run';
  validCase: CaseFileInput;
  spec: MonteCarloSpec;
  /** Int32Array over a SharedArrayBuffer: [0] is the first iteration no worker has taken yet */
  next: SharedArrayBuffer;
  /** iterations taken at a time */
  chunk: number;
  /** Int32Array over a SharedArrayBuffer: [0] != 0 means stop */
  stop: SharedArrayBuffer;
  /** Float64 npvs of the whole job, iteration i at double i · trucks · 3 */
  out: SharedArrayBuffer;
  progressEvery: number;
}

/** Iterations [from, from + done) of a job, finished by one worker. */
export type DoneRange = [from: number, done: number];

export interface SummariseRequest {
  type: 'summarise';
  truckIds: string[];
  /** the run's npvs, iteration after iteration, in the first `length` doubles */
  npvs: SharedArrayBuffer;
  length: number;
  trucksFrom: number;
  trucksTo: number;
  fleet: boolean;
  /** the run's proposal (spec.proposal), for the fleet's proposal figure */
  proposal?: MonteCarloSpec['proposal'];
}

export type WorkerRequest = RunRequest | SummariseRequest;

export type WorkerMessage =
  | { type: 'progress'; done: number }
  | { type: 'done'; done: number; ranges: DoneRange[] }
  | { type: 'summary'; trucks: TruckRisk[]; fleet: MonteCarloResult['fleet'] | null };

// The progress and stop callbacks are the same two functions for every chunk and every run, reading
// these: a new closure per chunk would make the optimised iteration loop see a new call target and
// fall back to unoptimised code at the start of each run.
let stopFlag: Int32Array<ArrayBufferLike> = new Int32Array(1);
let progressBase = 0;
function reportProgress(n: number): void {
  parentPort?.postMessage({ type: 'progress', done: progressBase + n } satisfies WorkerMessage);
}
function shouldStop(): boolean {
  return Atomics.load(stopFlag, 0) !== 0;
}

function handle(m: WorkerRequest): WorkerMessage {
  if (m.type === 'run') {
    stopFlag = new Int32Array(m.stop);
    const next = new Int32Array(m.next);
    const total = m.spec.iterations;
    const perIteration = m.validCase.trucks.length * 3;
    const runner = new IterationRunner(m.validCase, m.spec);
    const control: RunControl = { every: m.progressEvery, onProgress: reportProgress, shouldStop };
    const ranges: DoneRange[] = [];
    let done = 0;
    while (!shouldStop()) {
      const from = Atomics.add(next, 0, m.chunk);
      if (from >= total) break;
      const to = Math.min(total, from + m.chunk);
      progressBase = done;
      control.into = new Float64Array(m.out, from * perIteration * 8, (to - from) * perIteration);
      const ran = runner.run(from, to, control).done;
      ranges.push([from, ran]);
      done += ran;
      progressBase = done;
      reportProgress(0);
      if (ran < to - from) break;
    }
    return { type: 'done', done, ranges };
  }
  const npvs = new Float64Array(m.npvs, 0, m.length);
  return {
    type: 'summary',
    trucks: summariseTrucks(m.truckIds, npvs, m.trucksFrom, m.trucksTo),
    fleet: m.fleet ? summariseFleet(m.truckIds.length, npvs, m.proposal ? proposalSlots(m.truckIds, m.proposal) : null) : null,
  };
}

// errors are thrown out of the handler: the thread then exits with an 'error' event the pool reports
parentPort?.on('message', (m: WorkerRequest) => parentPort?.postMessage(handle(m)));
