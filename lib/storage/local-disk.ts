import fs from 'node:fs';
import fsp from 'node:fs/promises';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { pipeline } from 'node:stream/promises';
import { dataDir } from '@/lib/db/config';
import { env } from '@/lib/env';
import { checkKey, exactly, type Storage } from './types';

/** `HAULCASE_UPLOAD_DIR`, else `uploads/` in the data folder. Read at each call so tests can point it elsewhere. */
export function uploadRoot(raw: Record<string, string | undefined> = process.env): string {
  return path.resolve(/*turbopackIgnore: true*/ env(raw).HAULCASE_UPLOAD_DIR || path.join(dataDir(raw), 'uploads'));
}

/**
 * Files under `root`, one per key (`ws1/offer2/<uuid>`). A put streams into a
 * temporary file beside the target and renames it into place once all the
 * bytes are written, so a reader never sees half a file.
 */
export function localDiskStorage(root: string): Storage {
  const file = (key: string) => {
    checkKey(key);
    return path.join(root, ...key.split('/'));
  };
  return {
    kind: 'disk',
    async put(key, body, size) {
      const f = file(key);
      await fsp.mkdir(path.dirname(f), { recursive: true });
      const tmp = `${f}.part-${randomUUID()}`;
      const out = fs.createWriteStream(tmp, { flags: 'wx' });
      try {
        await pipeline(exactly(key, body, size), out);
        await fsp.rename(tmp, f);
      } catch (e) {
        // a body refused before the file was opened still creates it when the open completes: wait for the
        // stream to close, then remove what it left
        if (!out.closed) await new Promise<void>((resolve) => out.once('close', () => resolve()));
        await fsp.rm(tmp, { force: true });
        throw e;
      }
    },
    async get(key) {
      const f = file(key);
      let handle: fsp.FileHandle;
      try {
        handle = await fsp.open(f, 'r');
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
        throw e;
      }
      // size and stream from one open file, so a concurrent replace cannot mismatch them
      const { size } = await handle.stat();
      return { body: handle.createReadStream(), size };
    },
    async delete(key) {
      await fsp.rm(file(key), { force: true });
    },
    async exists(key) {
      try {
        return (await fsp.stat(file(key))).isFile();
      } catch (e) {
        if ((e as NodeJS.ErrnoException).code === 'ENOENT') return false;
        throw e;
      }
    },
  };
}
