import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { dataDir } from '../db/config';
import { env } from '../env';

/**
 * The JWT signing secret: `NEXTAUTH_SECRET` when set (production), otherwise a random
 * secret kept in the data folder so that a demo install (SQLite) works with no set-up and
 * sessions survive a restart. With PostgreSQL the secret must be set (lib/env.ts).
 */
export function authSecret(): string {
  const e = env();
  if (e.NEXTAUTH_SECRET) return e.NEXTAUTH_SECRET;
  // Several servers on one PostgreSQL must share the secret; the schema refuses to start without it.
  if (e.DATABASE_URL) throw new Error('NEXTAUTH_SECRET is required with PostgreSQL (DATABASE_URL is set).');
  const file = path.join(dataDir(), '.auth-secret');
  try {
    return fs.readFileSync(file, 'utf8').trim();
  } catch {
    fs.mkdirSync(path.dirname(file), { recursive: true });
    const secret = crypto.randomBytes(32).toString('base64url');
    try {
      fs.writeFileSync(file, secret, { flag: 'wx', mode: 0o600 });
      return secret;
    } catch {
      return fs.readFileSync(file, 'utf8').trim(); // another process wrote it first
    }
  }
}
