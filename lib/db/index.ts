import 'server-only';
import type { Knex } from 'knex';
import { createKnex } from './connection';

// One Knex instance per server process, kept across hot reloads in development.
const holder = globalThis as unknown as { __haulcaseDb?: Knex };

export function db(): Knex {
  if (!holder.__haulcaseDb) holder.__haulcaseDb = createKnex();
  return holder.__haulcaseDb;
}

/** Tests point the app's queries at their own database. */
export function useDbForTests(k: Knex): void {
  holder.__haulcaseDb = k;
}
