import path from 'node:path';
import fs from 'node:fs';
import type { Knex } from 'knex';
import { migrationSource } from '../../db/migrations';

/** Folder for the SQLite file and uploaded documents; `HAULCASE_DATA_DIR`, default `./data`. */
export function dataDir(env: Record<string, string | undefined> = process.env): string {
  return path.resolve(/*turbopackIgnore: true*/ env.HAULCASE_DATA_DIR || path.join(process.cwd(), "data"));
}

/**
 * The one Knex configuration: PostgreSQL when `DATABASE_URL` is set, otherwise
 * SQLite (better-sqlite3) in the data folder with WAL, foreign keys and a busy timeout.
 */
export function knexConfig(env: Record<string, string | undefined> = process.env): Knex.Config {
  const common = { migrations: { migrationSource, tableName: 'knex_migrations' } };
  if (env.DATABASE_URL) {
    return { client: 'pg', connection: env.DATABASE_URL, pool: { min: 0, max: 10 }, ...common };
  }
  const dir = dataDir(env);
  fs.mkdirSync(dir, { recursive: true });
  const filename = env.HAULCASE_SQLITE_FILE || path.join(dir, 'haulcase.sqlite');
  return {
    client: 'better-sqlite3',
    connection: { filename },
    useNullAsDefault: true,
    pool: {
      min: 1,
      max: 1,
      afterCreate(conn: { pragma: (s: string) => unknown }, done: (err: Error | null, conn: unknown) => void) {
        conn.pragma('journal_mode = WAL');
        conn.pragma('foreign_keys = ON');
        conn.pragma('busy_timeout = 5000');
        conn.pragma('synchronous = NORMAL');
        done(null, conn);
      },
    },
    ...common,
  };
}
