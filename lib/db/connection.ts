import knex, { type Knex } from 'knex';
import { knexConfig } from './config';

/** A new Knex instance for the configured database (scripts and tests; the app uses `db()`). */
export function createKnex(env: Record<string, string | undefined> = process.env): Knex {
  return knex(knexConfig(env));
}

export const isPostgres = (k: Knex) => k.client.config.client === 'pg';

/** Run all pending migrations. */
export async function migrateLatest(k: Knex): Promise<void> {
  await k.migrate.latest();
}
