/**
 * Entry of the workbook worker thread (bundled by scripts/build-workers.ts
 * into .haulcase/workbook-worker.cjs), kept between exports
 * (workbook-pool.ts): each export, one answer with its id. It evaluates
 * the case and streams the workbook into the file it is given
 * (`writeWorkbookFile`, the same code the request thread runs without the
 * bundle); a case the engine refuses comes back as 422 and its problem.
 */
import { parentPort } from 'node:worker_threads';
import { EventLimitError } from '@/lib/engine/limits';
import type { WorkbookJob, WorkbookReply } from './workbook-job';
import { writeWorkbookFile } from './write-workbook-file';

parentPort?.on('message', (job: WorkbookJob) => {
  void writeWorkbookFile(job.caseFile, job.meta, job.file).then(
    (bytes) => parentPort?.postMessage({ id: job.id, ...({ ok: true, bytes } satisfies WorkbookReply) }),
    (err: unknown) => {
      let reply: WorkbookReply;
      if (err instanceof EventLimitError) reply = { ok: false, kind: 'http', status: 422, message: 'This case cannot be evaluated.', problems: [{ path: `truck ${err.truckId}`, message: err.message }] };
      else reply = { ok: false, kind: 'error', status: 500, message: err instanceof Error ? err.stack ?? err.message : String(err) };
      parentPort?.postMessage({ id: job.id, ...reply });
    },
  );
});
