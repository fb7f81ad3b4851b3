import type { Knex } from 'knex';

/**
 * Every "forgot password" request, kept briefly to throttle them per e-mail and
 * per address. Recorded whether or not the address has an account, so the
 * throttle itself cannot tell anyone which addresses exist.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('password_reset_requests', (t) => {
    t.increments('id').primary();
    t.string('email', 320).notNullable();
    t.string('address', 64).notNullable();
    t.string('at', 32).notNullable();
    t.index(['email', 'at']);
    t.index(['address', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('password_reset_requests');
}
