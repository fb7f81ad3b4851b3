/**
 * The break-even analysis off the request thread: it evaluates the case
 * about a thousand times for the demo's drivers (each a scan of the range and
 * a root search, most of them over physical inputs that change the expected
 * quantities), seconds of work that would hold every other request of the
 * server. Each request starts one worker thread (the bundle
 * .haulcase/break-even-worker.cjs, built by `npm run build:workers`; another
 * path in HAULCASE_BREAK_EVEN_WORKER), which runs `runBreakEven` — the same
 * checks and engine as on the thread — and ends when it has answered. A
 * request that runs past HAULCASE_BREAK_EVEN_TIME_LIMIT_MS (default 120,000)
 * is stopped and answers 503. Where the bundle is missing (a test calling the
 * handler without building it) the analysis runs on the request thread, as
 * before, and the server says so once in its log.
 */
import 'server-only';
import { existsSync } from 'node:fs';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import { env } from '@/lib/env';
import { HttpError } from '@/lib/http';
import { runBreakEven } from '@/lib/risk/requests';
import type { BreakEvenJob, BreakEvenReply } from './break-even-job';

export function breakEvenWorkerPath(): string {
  return env().HAULCASE_BREAK_EVEN_WORKER ?? path.join(/* turbopackIgnore: true */ process.cwd(), '.haulcase', 'break-even-worker.cjs');
}

let warned = false;

export async function runBreakEvenOffThread(caseFile: BreakEvenJob['caseFile'], proposal: BreakEvenJob['proposal'], body: BreakEvenJob['body']): Promise<ReturnType<typeof runBreakEven>> {
  const bundle = breakEvenWorkerPath();
  // (the comments keep Turbopack from tracing the path: it would pull the whole app folder into the route)
  if (!existsSync(/* turbopackIgnore: true */ bundle)) {
    if (!warned) console.warn(`break-even: no worker bundle at ${bundle} (npm run build:workers); computing on the request thread`);
    warned = true;
    return runBreakEven(caseFile, proposal, body);
  }
  const limit = env().HAULCASE_BREAK_EVEN_TIME_LIMIT_MS;
  const reply = await new Promise<BreakEvenReply>((resolve, reject) => {
    const worker = new Worker(/* turbopackIgnore: true */ bundle);
    const timer = setTimeout(() => {
      void worker.terminate();
      reject(new HttpError(503, `The break-even analysis took longer than ${Math.round(limit / 1000)} s and was stopped; choose fewer drivers.`));
    }, limit);
    const finish = () => clearTimeout(timer);
    worker.once('message', (r: BreakEvenReply) => {
      finish();
      void worker.terminate();
      resolve(r);
    });
    worker.once('error', (err) => {
      finish();
      reject(err);
    });
    worker.once('exit', (code) => {
      finish();
      if (code !== 0) reject(new Error(`break-even worker exited with code ${code}`));
    });
    const job: BreakEvenJob = { caseFile, proposal, body };
    worker.postMessage(job);
  });
  if (reply.ok) return reply.value;
  if (reply.kind === 'http') throw new HttpError(reply.status, reply.message, reply.problems);
  throw new Error(`break-even worker: ${reply.message}`);
}
