/**
 * The workbook export off the request thread (issue 18): a 2,000-truck
 * workbook is tens of seconds of work that would hold every other request of
 * the server. Exports run in one worker thread kept between them
 * (workbook-pool.ts; it ends after HAULCASE_EXPORT_IDLE_MS without work,
 * default 60,000) started from the bundle .haulcase/workbook-worker.cjs,
 * built by `npm run build:workers` (another path in HAULCASE_EXPORT_WORKER),
 * which evaluates the case and streams the workbook into a file in a fresh
 * temporary folder (`writeWorkbookFile`, the same code as on the thread);
 * the answer is a stream of that file, which
 * removes the folder once it has been read or cancelled, so neither thread
 * holds the whole workbook. An export that runs past
 * HAULCASE_EXPORT_TIME_LIMIT_MS (default 300,000) is stopped and answers 503.
 * Where the bundle is missing (a test calling the handler without building
 * it) the export runs on the request thread, still streamed to the file, and
 * the server says so once in its log.
 */
import 'server-only';
import { createReadStream, existsSync } from 'node:fs';
import { mkdtemp, rm } from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { env } from '@/lib/env';
import { HttpError } from '@/lib/http';
import type { CaseFile } from '@/lib/validation/case';
import type { WorkbookMeta } from './types';
import type { WorkbookJob, WorkbookReply } from './workbook-job';
import { runWorkbookJob, WorkbookTimeoutError } from './workbook-pool';
import { writeWorkbookFile } from './write-workbook-file';

export function workbookWorkerPath(): string {
  return env().HAULCASE_EXPORT_WORKER ?? path.join(/* turbopackIgnore: true */ process.cwd(), '.haulcase', 'workbook-worker.cjs');
}

/** A written workbook: its bytes as a stream (read once) and its size. */
export interface WorkbookFile {
  stream: ReadableStream<Uint8Array>;
  bytes: number;
}

let warned = false;

async function writeInWorker(bundle: string, job: Omit<WorkbookJob, 'id'>): Promise<number> {
  const limit = env().HAULCASE_EXPORT_TIME_LIMIT_MS;
  let reply: WorkbookReply;
  try {
    reply = await runWorkbookJob({ bundle, timeLimitMs: limit, idleMs: env().HAULCASE_EXPORT_IDLE_MS }, job);
  } catch (err) {
    if (err instanceof WorkbookTimeoutError) throw new HttpError(503, `The workbook export took longer than ${Math.round(limit / 1000)} s and was stopped.`);
    throw err;
  }
  if (reply.ok) return reply.bytes;
  if (reply.kind === 'http') throw new HttpError(reply.status, reply.message, reply.problems);
  throw new Error(`workbook worker: ${reply.message}`);
}

/** Evaluates the case and writes its workbook, in a worker thread where the bundle is built. */
export async function exportWorkbookOffThread(caseFile: CaseFile, meta: WorkbookMeta): Promise<WorkbookFile> {
  const dir = await mkdtemp(path.join(os.tmpdir(), 'haulcase-export-'));
  const file = path.join(dir, 'workbook.xlsx');
  const cleanup = () => rm(dir, { recursive: true, force: true }).catch(() => undefined);
  try {
    const bundle = workbookWorkerPath();
    // (the comments keep Turbopack from tracing the path: it would pull the whole app folder into the route)
    let bytes: number;
    if (existsSync(/* turbopackIgnore: true */ bundle)) {
      bytes = await writeInWorker(bundle, { caseFile, meta, file });
    } else {
      if (!warned) console.warn(`workbook export: no worker bundle at ${bundle} (npm run build:workers); writing on the request thread`);
      warned = true;
      bytes = await writeWorkbookFile(caseFile, meta, file);
    }
    const source = createReadStream(/* turbopackIgnore: true */ file);
    source.once('close', () => void cleanup());
    return { stream: Readable.toWeb(source) as ReadableStream<Uint8Array>, bytes };
  } catch (err) {
    await cleanup();
    throw err;
  }
}
