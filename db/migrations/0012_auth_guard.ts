import type { Knex } from 'knex';

/**
 * throttle_counters: one row per throttled key (sign-in per account and
 * address, per account, per address; password reset per address), counted
 * with the row locked before a password is checked (lib/auth/throttle.ts), so
 * concurrent attempts cannot all slip past the limit. `since` starts the window
 * (or holds the last attempt, for growing delays), `nextAt` is the earliest
 * time the key is admitted again (null: now). Replaces sign_in_attempts, whose
 * read-then-insert let a burst of attempts through.
 * users.sessionStamp: moved when the user signs out; a session whose token
 * carries another stamp no longer counts (lib/auth/session-current.ts).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('throttle_counters', (t) => {
    t.string('key', 400).primary();
    t.integer('count').notNullable().defaultTo(0);
    t.string('since', 32).notNullable();
    t.string('nextAt', 32).nullable();
  });
  await knex.schema.dropTableIfExists('sign_in_attempts');
  await knex.schema.alterTable('users', (t) => {
    t.string('sessionStamp', 32).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('sessionStamp');
  });
  await knex.schema.createTable('sign_in_attempts', (t) => {
    t.increments('id').primary();
    t.string('email', 320).notNullable();
    t.string('address', 64).notNullable();
    t.boolean('succeeded').notNullable();
    t.string('at', 32).notNullable();
    t.index(['email', 'address', 'at']);
    t.index(['address', 'at']);
  });
  await knex.schema.dropTableIfExists('throttle_counters');
}
