import type { Knex } from 'knex';

/**
 * business_cases.engineLives: the planned overhaul life a case adopts for some
 * engine types in place of the engine library's (issue 15, recommended
 * overhaul life): JSON `{ [engineTypeId]: lifeHours }`, whole hours within the
 * case file's `lifeHours` range. Null: the case reads the library, as before.
 * (Numbered 0019 so that 0018 stays free for the re-forecast work.)
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.text('engineLives').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.dropColumn('engineLives');
  });
}
