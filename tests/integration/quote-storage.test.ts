import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { randomBytes } from 'node:crypto';
import { Readable } from 'node:stream';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import type { Knex } from 'knex';
import { GetObjectCommand, ListObjectsV2Command, S3Client } from '@aws-sdk/client-s3';
import { useDbForTests } from '@/lib/db';
import { getStorage } from '@/lib/storage';
import * as docs from '@/app/api/workspaces/[workspace]/offers/[id]/documents/route';
import * as doc from '@/app/api/workspaces/[workspace]/offers/[id]/documents/[docId]/route';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

/** A 3 MB "PNG": the real signature, then random bytes (many stream chunks, no repeating pattern to hide a shifted byte). */
function bigPng(): Uint8Array {
  const b = new Uint8Array(randomBytes(3 * 1024 * 1024 + 17));
  b.set([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  return b;
}
const upload = (name: string, bytes: Uint8Array) => {
  const f = new FormData();
  f.set('file', new File([bytes as BlobPart], name));
  return f;
};

/** What is really stored, read without the app's storage code: the folder, or the bucket through its own client. */
type Backend = {
  keys: (prefix: string) => Promise<string[]>;
  read: (key: string) => Promise<Buffer | null>;
};

function diskBackend(root: string): Backend {
  const file = (key: string) => path.join(root, ...key.split('/'));
  return {
    async keys(prefix) {
      const dir = file(prefix.replace(/\/$/, ''));
      if (!fs.existsSync(dir)) return [];
      return (fs.readdirSync(dir, { recursive: true }) as string[]).filter((f) => fs.statSync(path.join(dir, f)).isFile()).map((f) => `${prefix}${f}`);
    },
    async read(key) {
      return fs.existsSync(file(key)) ? fs.readFileSync(file(key)) : null;
    },
  };
}

function bucketBackend(env: Record<string, string>): Backend {
  const client = new S3Client({ endpoint: env.AWS_ENDPOINT_URL, region: env.AWS_REGION, forcePathStyle: true, credentials: { accessKeyId: env.AWS_ACCESS_KEY_ID, secretAccessKey: env.AWS_SECRET_ACCESS_KEY } });
  return {
    async keys(prefix) {
      const r = await client.send(new ListObjectsV2Command({ Bucket: env.S3_BUCKET, Prefix: prefix }));
      return (r.Contents ?? []).map((o) => o.Key as string);
    },
    async read(key) {
      try {
        const r = await client.send(new GetObjectCommand({ Bucket: env.S3_BUCKET, Key: key }));
        return Buffer.from(await r.Body!.transformToByteArray());
      } catch (e) {
        if ((e as Error).name === 'NoSuchKey') return null;
        throw e;
      }
    },
  };
}

/** A trigger that makes the next insert or delete on quote_documents fail inside its transaction. */
async function failNext(k: Knex, pg: boolean, op: 'insert' | 'delete') {
  if (pg) {
    await k.raw(`create or replace function t_refuse() returns trigger language plpgsql as $$ begin raise exception 'test: % refused', tg_op; end $$`);
    await k.raw(`create trigger t_refuse_${op} before ${op} on quote_documents for each row execute function t_refuse()`);
  } else {
    await k.raw(`create trigger t_refuse_${op} before ${op} on quote_documents begin select raise(abort, 'test: ${op} refused'); end`);
  }
  return () => k.raw(pg ? `drop trigger t_refuse_${op} on quote_documents` : `drop trigger t_refuse_${op}`);
}

const S3_VARS = ['S3_BUCKET', 'AWS_ENDPOINT_URL', 'AWS_REGION', 'AWS_ACCESS_KEY_ID', 'AWS_SECRET_ACCESS_KEY'];

describe.each([
  { name: 'SQLite, local disk', pg: false, s3: false },
  { name: 'PostgreSQL, local disk', pg: true, s3: false },
  { name: 'SQLite, S3 (s3rver)', pg: false, s3: true },
  { name: 'PostgreSQL, S3 (s3rver)', pg: true, s3: true },
])('quote documents stored on $name', ({ pg, s3 }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let offerId: string;
  let prefix: string;
  let uploadDir: string;
  let backend: Backend;
  const as = (role: string) => signInAs(ids[`${role}@aldervane.test`]);
  const post = (name: string, bytes: Uint8Array) => call(docs.POST, { workspace: WS, id: offerId }, { body: upload(name, bytes) });
  const download = (id: number) => call(doc.GET, { workspace: WS, id: offerId, docId: String(id) });
  const remove = (id: number) => call(doc.DELETE, { workspace: WS, id: offerId, docId: String(id) }, { method: 'DELETE' });

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    const ws = await k('workspaces').where({ slug: WS }).first('id');
    const offer = (await k('repower_offers').where({ workspaceId: ws.id }).orderBy('id').first('id')).id;
    offerId = String(offer);
    // a database of its own, but the bucket is shared by the describe blocks: keys are per workspace and offer, so each block starts clean
    prefix = `ws${ws.id}/offer${offer}/`;
    uploadDir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-uploads-'));
    if (s3) {
      const env = inject('s3Env');
      Object.assign(process.env, env);
      backend = bucketBackend(env);
      for (const key of await backend.keys(prefix)) await getStorage().delete(key);
    } else {
      process.env.HAULCASE_UPLOAD_DIR = uploadDir;
      backend = diskBackend(uploadDir);
    }
  });
  afterAll(async () => {
    for (const v of [...S3_VARS, 'HAULCASE_UPLOAD_DIR']) delete process.env[v];
    fs.rmSync(uploadDir, { recursive: true, force: true });
    await destroy();
  });

  it('uses the backend the environment names', () => {
    expect(getStorage().kind).toBe(s3 ? 's3' : 'disk');
  });

  it('uploads a 3 MB file, stores exactly its bytes, downloads them byte for byte, and deletes them after the commit', async () => {
    const bytes = bigPng();
    as('analyst');
    const r = await post('Kestrel quote scan.png', bytes);
    expect(r.status).toBe(201);
    expect(r.body).toMatchObject({ contentType: 'image/png', size: bytes.length });
    const { storageKey } = await k('quote_documents').where({ id: r.body.id }).first('storageKey');
    expect(storageKey.startsWith(prefix)).toBe(true);
    expect(await backend.keys(prefix)).toEqual([storageKey]);
    expect(Buffer.from(bytes).equals((await backend.read(storageKey))!)).toBe(true);
    expect(await getStorage().exists(storageKey)).toBe(true);

    as('viewer');
    const dl = await download(r.body.id);
    expect(dl.status).toBe(200);
    expect(dl.response.headers.get('content-length')).toBe(String(bytes.length));
    expect(dl.response.headers.get('content-type')).toBe('image/png');
    expect(Buffer.from(await dl.response.arrayBuffer()).equals(Buffer.from(bytes))).toBe(true);

    as('admin');
    expect((await remove(r.body.id)).status).toBe(204);
    expect(await k('quote_documents').where({ id: r.body.id }).first()).toBeUndefined();
    expect(await backend.keys(prefix)).toEqual([]);
    expect(await getStorage().exists(storageKey)).toBe(false);
  });

  it('leaves no row and no file when the upload transaction fails after the bytes were stored', async () => {
    const rows = await k('quote_documents').count({ n: '*' }).first();
    const audits = await k('audit_log').count({ n: '*' }).first();
    const undo = await failNext(k, pg, 'insert');
    const quiet = vi.spyOn(console, 'error').mockImplementation(() => {});
    try {
      as('analyst');
      const r = await post('Kestrel quote scan.png', bigPng());
      expect(r.status).toBe(500);
    } finally {
      quiet.mockRestore();
      await undo();
    }
    expect(await k('quote_documents').count({ n: '*' }).first()).toEqual(rows);
    expect(await k('audit_log').count({ n: '*' }).first()).toEqual(audits);
    expect(await backend.keys(prefix)).toEqual([]);
  });

  it('keeps the file when the delete transaction fails, so the row still downloads whole', async () => {
    const bytes = bigPng();
    as('analyst');
    const r = await post('Kestrel quote scan.png', bytes);
    expect(r.status).toBe(201);
    const undo = await failNext(k, pg, 'delete');
    const quiet = vi.spyOn(console, 'error').mockImplementation(() => {});
    try {
      as('admin');
      expect((await remove(r.body.id)).status).toBe(500);
    } finally {
      quiet.mockRestore();
      await undo();
    }
    expect(await k('quote_documents').where({ id: r.body.id }).first('id')).toBeTruthy();
    const dl = await download(r.body.id);
    expect(Buffer.from(await dl.response.arrayBuffer()).equals(Buffer.from(bytes))).toBe(true);
    expect((await remove(r.body.id)).status).toBe(204);
    expect(await backend.keys(prefix)).toEqual([]);
  });

  it('answers 404 naming the missing file when a row has lost its bytes', async () => {
    as('analyst');
    const r = await post('q.png', bigPng());
    const { storageKey } = await k('quote_documents').where({ id: r.body.id }).first('storageKey');
    await getStorage().delete(storageKey);
    const dl = await download(r.body.id);
    expect(dl.status).toBe(404);
    expect(dl.body.error).toBe('The stored file is missing.');
    as('admin');
    expect((await remove(r.body.id)).status).toBe(204);
  });

  it('refuses a body shorter or longer than its declared size', { timeout: 20_000 }, async () => {
    // a key of its own, outside the offer's prefix that the other tests list
    const key = `check/${pg ? 'pg' : 'sqlite'}-${randomBytes(8).toString('hex')}`;
    const storage = getStorage();
    await expect(storage.put(key, Readable.from([Buffer.from('%PDF-1.4 only part')]), 1000)).rejects.toThrow(/received 18 bytes, expected 1000/);
    await expect(storage.put(key, Readable.from([Buffer.from('%PDF-1.4 '), Buffer.from('one byte too many')]), 20)).rejects.toThrow(/received 26 bytes, expected 20/);
    // The disk writes into a temporary file and renames only a whole one. (S3 stores nothing for a request
    // cut short of its Content-Length; the s3rver fake keeps what an aborted request sent, so it is not checked there.)
    if (storage.kind === 'disk') {
      expect(await storage.exists(key)).toBe(false);
      expect(fs.readdirSync(uploadDir, { recursive: true }).filter((f) => String(f).includes('.part-'))).toEqual([]);
    }
  });
});
