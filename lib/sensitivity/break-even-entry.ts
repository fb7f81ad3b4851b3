/**
 * Entry of the break-even worker thread (bundled by scripts/build-workers.ts
 * into .haulcase/break-even-worker.cjs): one request, one answer. The
 * request's checks and the engine run here exactly as on the request thread
 * (`runBreakEven`); a refused request comes back as its status, message and
 * problems, which the server turns into the same answer.
 */
import { parentPort } from 'node:worker_threads';
import { EventLimitError } from '@/lib/engine/limits';
import { HttpError } from '@/lib/http';
import { runBreakEven } from '@/lib/risk/requests';
import type { BreakEvenJob, BreakEvenReply } from './break-even-job';

parentPort?.on('message', (job: BreakEvenJob) => {
  let reply: BreakEvenReply;
  try {
    reply = { ok: true, value: runBreakEven(job.caseFile, job.proposal, job.body) };
  } catch (err) {
    if (err instanceof HttpError) reply = { ok: false, kind: 'http', status: err.status, message: err.message, problems: err.problems };
    else if (err instanceof EventLimitError) reply = { ok: false, kind: 'http', status: 422, message: 'This case cannot be evaluated.', problems: [{ path: `truck ${err.truckId}`, message: err.message }] };
    else reply = { ok: false, kind: 'error', status: 500, message: err instanceof Error ? err.stack ?? err.message : String(err) };
  }
  parentPort?.postMessage(reply);
});
