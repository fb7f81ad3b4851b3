/**
 * One workbook worker thread, kept between exports (issue 18): a worker
 * started for each export spent most of a 100-truck export starting up and
 * running its code cold (about 1.4 s of 2.3 s of CPU). The thread starts
 * with the first export, takes the exports that follow (each answered by
 * its id; exports at the same time share it), and ends after `idleMs`
 * without work; it does not keep the process alive while idle. An export
 * past `timeLimitMs` stops the thread (and with it any export it was
 * writing). No server-only imports: the benchmark runs it in plain Node.
 */
import { Worker } from 'node:worker_threads';
import type { WorkbookJob, WorkbookReply } from './workbook-job';

export interface WorkbookPoolOptions {
  bundle: string;
  timeLimitMs: number;
  idleMs: number;
}

/** An export stopped at the time limit. */
export class WorkbookTimeoutError extends Error {
  constructor(readonly limitMs: number) {
    super(`the workbook export took longer than ${limitMs} ms and was stopped`);
    this.name = 'WorkbookTimeoutError';
  }
}

interface Waiting {
  resolve(reply: WorkbookReply): void;
  reject(err: Error): void;
  timer: NodeJS.Timeout;
}

interface Thread {
  worker: Worker;
  bundle: string;
  waiting: Map<number, Waiting>;
  idle: NodeJS.Timeout | null;
}

let thread: Thread | null = null;
let nextId = 1;
let starts = 0;

/** Worker threads started so far (tests). */
export function workbookWorkerStarts(): number {
  return starts;
}

function stop(t: Thread, err: Error): void {
  if (thread === t) thread = null;
  if (t.idle) clearTimeout(t.idle);
  for (const w of t.waiting.values()) {
    clearTimeout(w.timer);
    w.reject(err);
  }
  t.waiting.clear();
  void t.worker.terminate();
}

function startThread(bundle: string): Thread {
  const worker = new Worker(/* turbopackIgnore: true */ bundle);
  starts++;
  const t: Thread = { worker, bundle, waiting: new Map(), idle: null };
  worker.on('message', (reply: WorkbookReply & { id: number }) => {
    const w = t.waiting.get(reply.id);
    if (!w) return;
    t.waiting.delete(reply.id);
    clearTimeout(w.timer);
    w.resolve(reply);
    if (t.waiting.size === 0) rest(t);
  });
  worker.once('error', (err) => stop(t, err));
  worker.once('exit', (code) => stop(t, new Error(`workbook worker exited with code ${code}`)));
  return t;
}

let idleMs = 60_000;

/** No export waiting: let the process exit without it, and end it after idleMs. */
function rest(t: Thread): void {
  t.worker.unref();
  if (t.idle) clearTimeout(t.idle);
  t.idle = setTimeout(() => stop(t, new Error('workbook worker ended (idle)')), idleMs);
  t.idle.unref();
}

/** Writes one workbook in the shared worker thread; answers the worker's reply. */
export function runWorkbookJob(options: WorkbookPoolOptions, job: Omit<WorkbookJob, 'id'>): Promise<WorkbookReply> {
  idleMs = options.idleMs;
  if (thread && thread.bundle !== options.bundle) stop(thread, new Error('workbook worker replaced'));
  const t = (thread ??= startThread(options.bundle));
  if (t.idle) clearTimeout(t.idle);
  t.idle = null;
  t.worker.ref();
  const id = nextId++;
  return new Promise<WorkbookReply>((resolve, reject) => {
    const timer = setTimeout(() => {
      t.waiting.delete(id);
      reject(new WorkbookTimeoutError(options.timeLimitMs));
      stop(t, new Error('workbook worker stopped: another export ran past the time limit'));
    }, options.timeLimitMs);
    t.waiting.set(id, { resolve, reject, timer });
    t.worker.postMessage({ ...job, id } satisfies WorkbookJob);
  });
}
