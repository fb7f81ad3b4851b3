import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import knex, { type Knex } from 'knex';
import { knexConfig } from '@/lib/db/config';
import { seedDemo } from '@/db/seeds/demo';

/**
 * A fresh, migrated and seeded database for one test file: SQLite in a temp folder,
 * or a new database on the test PostgreSQL server when `pgUrl` is given.
 */
export async function createTestDb(opts: { pgUrl?: string; seed?: boolean } = {}): Promise<{ k: Knex; dataDir: string; url: string | null; destroy: () => Promise<void> }> {
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'haulcase-test-'));
  let k: Knex;
  let dropDb: (() => Promise<void>) | null = null;
  let url: string | null = null;
  if (opts.pgUrl) {
    const name = `t_${Date.now()}_${Math.floor(Math.random() * 1e6)}`;
    const admin = knex({ client: 'pg', connection: opts.pgUrl });
    await admin.raw(`create database ${name}`);
    await admin.destroy();
    url = opts.pgUrl.replace(/\/[^/]*$/, `/${name}`);
    k = knex(knexConfig({ DATABASE_URL: url }));
    dropDb = async () => {
      const a = knex({ client: 'pg', connection: opts.pgUrl });
      await a.raw(`drop database if exists ${name} with (force)`);
      await a.destroy();
    };
  } else {
    k = knex(knexConfig({ HAULCASE_DATA_DIR: dataDir }));
  }
  await k.migrate.latest();
  if (opts.seed !== false) await seedDemo(k);
  return {
    k,
    dataDir,
    url,
    destroy: async () => {
      await k.destroy();
      if (dropDb) await dropDb();
      fs.rmSync(dataDir, { recursive: true, force: true });
    },
  };
}

/** Demo user ids by e-mail. */
export async function userIds(k: Knex): Promise<Record<string, number>> {
  const ids: Record<string, number> = {};
  for (const u of await k('users').select('id', 'email')) ids[u.email] = u.id;
  return ids;
}
