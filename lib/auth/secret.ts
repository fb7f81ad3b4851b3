import fs from 'node:fs';
import path from 'node:path';
import crypto from 'node:crypto';
import { dataDir } from '../db/config';

/**
 * The JWT signing secret: `NEXTAUTH_SECRET` when set (production), otherwise a random
 * secret kept in the data folder so that a demo install works with no set-up and
 * sessions survive a restart.
 */
export function authSecret(): string {
  if (process.env.NEXTAUTH_SECRET) return process.env.NEXTAUTH_SECRET;
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
