import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { freePort } from './ports';

/**
 * Starts a throw-away PostgreSQL server on loopback (Debian's postgresql package,
 * installed by .ci/run) and returns its URL and a stop function. As root the
 * server runs as the postgres user, as initdb requires.
 */
export async function startPostgres(): Promise<{ url: string; stop: () => void }> {
  const bin = findPgBin();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-pg-'));
  const asPostgres = process.getuid?.() === 0;
  if (asPostgres) execFileSync('chown', ['-R', 'postgres:postgres', dir]);
  const run = (cmd: string, args: string[]) => {
    const [c, a] = asPostgres ? ['runuser', ['-u', 'postgres', '--', path.join(bin, cmd), ...args]] : [path.join(bin, cmd), args];
    const r = spawnSync(c, a, { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`${cmd} failed: ${r.stderr || r.stdout}`);
  };
  const port = await freePort();
  run('initdb', ['-D', path.join(dir, 'data'), '-U', 'postgres', '--auth=trust', '-E', 'UTF8']);
  run('pg_ctl', ['-D', path.join(dir, 'data'), '-o', `-p ${port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off`, '-l', path.join(dir, 'log'), '-w', 'start']);
  return {
    url: `postgres://postgres@127.0.0.1:${port}/postgres`,
    stop: () => {
      try {
        run('pg_ctl', ['-D', path.join(dir, 'data'), '-m', 'immediate', '-w', 'stop']);
      } finally {
        fs.rmSync(dir, { recursive: true, force: true });
      }
    },
  };
}

function findPgBin(): string {
  const root = '/usr/lib/postgresql';
  const versions = fs.existsSync(root) ? fs.readdirSync(root).sort((a, b) => Number(b) - Number(a)) : [];
  for (const v of versions) {
    const bin = path.join(root, v, 'bin');
    if (fs.existsSync(path.join(bin, 'initdb'))) return bin;
  }
  throw new Error('PostgreSQL server binaries not found: install Debian\'s postgresql package (.ci/run does).');
}
