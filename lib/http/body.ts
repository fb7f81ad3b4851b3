import { IMPORT_LIMITS } from '@/lib/import/columns';
import { DOCUMENT_MAX_BYTES } from '@/lib/storage/file-types';

/**
 * How many bytes a request body may have, and what a refusal says. The limit is
 * checked twice: on `Content-Length` before anything is read, and on the bytes
 * actually streamed (a body without a length, or with a false one, is read
 * through a counting stream that stops at the limit), so no request makes the
 * server hold more than its limit in memory.
 */
export type BodyLimit = { bytes: number; message: string };

const KB = 1024;
const MB = 1024 * 1024;
/** Room for the multipart boundaries, part headers and small fields around an uploaded file. */
export const MULTIPART_ALLOWANCE = 64 * KB;

export const BODY_LIMITS = {
  /** next-auth's routes, forgot password, password reset, invitation accept. */
  auth: { bytes: 64 * KB, message: 'The request body is too large: the limit for sign-in and account requests is 64 KB.' },
  /** Every other JSON body of the API. */
  json: { bytes: 1 * MB, message: 'The request body is too large: the limit for a JSON request is 1 MB.' },
  /** A case/1 document uploaded to the workspace (the demo mine is about 10 KB). */
  caseFile: { bytes: 5 * MB, message: 'The case file is too large: the limit is 5 MB.' },
  /** Multipart upload of one quote document. */
  quoteDocument: {
    bytes: DOCUMENT_MAX_BYTES + MULTIPART_ALLOWANCE,
    message: `The upload is too large: a quote document may be at most ${DOCUMENT_MAX_BYTES / MB} MB.`,
  },
  /** Multipart upload of one CSV or XLSX fleet file. */
  fleetImport: {
    bytes: IMPORT_LIMITS.maxBytes + MULTIPART_ALLOWANCE,
    message: `The upload is too large: a fleet import file may be at most ${IMPORT_LIMITS.maxBytes / MB} MB.`,
  },
} satisfies Record<string, BodyLimit>;

/** A body over its limit: answered 413 by `route(…)` with the limit in the message. */
export class BodyTooLargeError extends Error {
  readonly status = 413;
  constructor(readonly limit: BodyLimit) {
    super(limit.message);
  }
}

/** Throws BodyTooLargeError when the request declares more bytes than the limit. */
export function checkContentLength(request: Request, limit: BodyLimit): void {
  const raw = request.headers.get('content-length');
  if (raw === null) return;
  const declared = Number(raw.trim());
  if (Number.isFinite(declared) && declared > limit.bytes) throw new BodyTooLargeError(limit);
}

/**
 * The body read through a counting stream: bytes are pulled from the source only
 * as the reader asks for them, and the stream fails with BodyTooLargeError (and
 * cancels the source, so nothing more is read) once more than the limit has come.
 */
export function capStream(source: ReadableStream<Uint8Array>, limit: BodyLimit): ReadableStream<Uint8Array> {
  const reader = source.getReader();
  let seen = 0;
  return new ReadableStream<Uint8Array>(
    {
      async pull(controller) {
        const { done, value } = await reader.read();
        if (done) return controller.close();
        seen += value.byteLength;
        if (seen > limit.bytes) {
          const err = new BodyTooLargeError(limit);
          controller.error(err);
          await reader.cancel(err).catch(() => {});
          return;
        }
        controller.enqueue(value);
      },
      async cancel(reason) {
        await reader.cancel(reason).catch(() => {});
      },
    },
    { highWaterMark: 0 },
  );
}

/**
 * The request with its body limited: 413 at once on a `Content-Length` over the
 * limit, otherwise a copy whose body is the capped stream (reading it with
 * `json()`, `text()`, `formData()` or `arrayBuffer()` fails with
 * BodyTooLargeError past the limit).
 */
export function limitBody(request: Request, limit: BodyLimit): Request {
  checkContentLength(request, limit);
  if (!request.body) return request;
  return new Request(request.url, {
    method: request.method,
    headers: request.headers,
    body: capStream(request.body, limit),
    signal: request.signal,
    // a stream body needs this in Node's fetch
    duplex: 'half',
  } as RequestInit);
}

/** Reads the whole body, at most the limit (BodyTooLargeError past it). */
export async function readBytes(request: Request, limit: BodyLimit): Promise<Uint8Array<ArrayBuffer>> {
  checkContentLength(request, limit);
  if (!request.body) return new Uint8Array(new ArrayBuffer(0));
  const reader = capStream(request.body, limit).getReader();
  const chunks: Uint8Array[] = [];
  let total = 0;
  for (;;) {
    const { done, value } = await reader.read();
    if (done) break;
    chunks.push(value);
    total += value.byteLength;
  }
  const out = new Uint8Array(total);
  let at = 0;
  for (const c of chunks) {
    out.set(c, at);
    at += c.byteLength;
  }
  return out;
}
