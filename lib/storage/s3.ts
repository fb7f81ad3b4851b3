import { Readable } from 'node:stream';
import { DeleteObjectCommand, GetObjectCommand, HeadObjectCommand, PutObjectCommand, S3Client, S3ServiceException } from '@aws-sdk/client-s3';
import type { Env } from '@/lib/env';
import { checkKey, exactly, type Storage } from './types';

export type S3Config = {
  bucket: string;
  region: string;
  /** An S3-compatible service's URL; unset for AWS itself. */
  endpoint?: string;
  forcePathStyle: boolean;
  /** Unset: the SDK's usual chain (instance role, shared files…). */
  credentials?: { accessKeyId: string; secretAccessKey: string };
};

/**
 * From the validated environment: `S3_BUCKET`, `AWS_REGION`, the endpoint in
 * `AWS_ENDPOINT_URL` or `S3_ENDPOINT`, the keys in `AWS_ACCESS_KEY_ID` and
 * `AWS_SECRET_ACCESS_KEY`. With an endpoint the requests are path-style
 * (`http://host:port/bucket/key`, what local and most S3-compatible servers
 * want) unless `S3_FORCE_PATH_STYLE=0`; without one (AWS) virtual-hosted unless
 * `S3_FORCE_PATH_STYLE=1`.
 */
export function s3ConfigFromEnv(e: Env): S3Config {
  if (!e.S3_BUCKET || !e.AWS_REGION) throw new Error('S3 storage needs S3_BUCKET and AWS_REGION');
  const endpoint = e.AWS_ENDPOINT_URL ?? e.S3_ENDPOINT;
  return {
    bucket: e.S3_BUCKET,
    region: e.AWS_REGION,
    endpoint,
    forcePathStyle: e.S3_FORCE_PATH_STYLE ? e.S3_FORCE_PATH_STYLE === '1' : endpoint !== undefined,
    credentials: e.AWS_ACCESS_KEY_ID && e.AWS_SECRET_ACCESS_KEY ? { accessKeyId: e.AWS_ACCESS_KEY_ID, secretAccessKey: e.AWS_SECRET_ACCESS_KEY } : undefined,
  };
}

// One client per configuration and process (it keeps its connections), shared across route bundles.
const holder = globalThis as unknown as { __haulcaseS3?: Map<string, S3Client> };

function clientFor(cfg: S3Config): S3Client {
  const clients = (holder.__haulcaseS3 ??= new Map());
  const key = JSON.stringify(cfg);
  let c = clients.get(key);
  if (!c) {
    c = new S3Client({
      region: cfg.region,
      endpoint: cfg.endpoint,
      forcePathStyle: cfg.forcePathStyle,
      credentials: cfg.credentials,
      // S3-compatible services do not all understand the SDK's default streaming
      // checksums (aws-chunked bodies); a local fake stores the framing as content.
      ...(cfg.endpoint ? { requestChecksumCalculation: 'WHEN_REQUIRED' as const, responseChecksumValidation: 'WHEN_REQUIRED' as const } : {}),
    });
    clients.set(key, c);
  }
  return c;
}

const missing = (e: unknown) => e instanceof S3ServiceException && (e.name === 'NoSuchKey' || e.name === 'NotFound' || e.$metadata?.httpStatusCode === 404);

/**
 * Objects in one bucket, one per key. A put streams the body with its
 * Content-Length (S3 refuses a body of another length and stores nothing), so
 * an object is there whole or not at all.
 */
export function s3Storage(cfg: S3Config): Storage {
  const client = clientFor(cfg);
  const Bucket = cfg.bucket;
  return {
    kind: 's3',
    async put(key, body, size) {
      checkKey(key);
      // The SDK does not end a request whose body stream fails, so a body of the
      // wrong length aborts the request itself (S3 then stores nothing).
      const abort = new AbortController();
      let failure: unknown = null;
      const counted = exactly(key, body, size);
      counted.once('error', (e) => {
        failure = e;
        abort.abort();
      });
      try {
        await client.send(new PutObjectCommand({ Bucket, Key: key, Body: counted, ContentLength: size, ContentType: 'application/octet-stream' }), { abortSignal: abort.signal });
      } catch (e) {
        throw failure ?? e;
      }
    },
    async get(key) {
      checkKey(key);
      try {
        const r = await client.send(new GetObjectCommand({ Bucket, Key: key }));
        if (!(r.Body instanceof Readable)) throw new Error('S3: expected a Node stream body');
        return { body: r.Body, size: Number(r.ContentLength) };
      } catch (e) {
        if (missing(e)) return null;
        throw e;
      }
    },
    async delete(key) {
      checkKey(key);
      await client.send(new DeleteObjectCommand({ Bucket, Key: key }));
    },
    async exists(key) {
      checkKey(key);
      try {
        await client.send(new HeadObjectCommand({ Bucket, Key: key }));
        return true;
      } catch (e) {
        if (missing(e)) return false;
        throw e;
      }
    },
  };
}
