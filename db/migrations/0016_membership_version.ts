import type { Knex } from 'knex';

/**
 * memberships.version: a member's role can now be changed and a member removed
 * (…/members/[userId], PATCH and DELETE), and like every other editable row a
 * membership carries a version so a change made on a stale page answers 409.
 * Existing memberships start at 1.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('memberships', (t) => {
    t.integer('version').notNullable().defaultTo(1);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('memberships', (t) => {
    t.dropColumn('version');
  });
}
