import type { Knex } from 'knex';

/**
 * business_cases.truckFigures: a case's own figures for some of its trucks,
 * in place of the register's (issue 20, re-forecast): JSON
 * `{ [truckId]: { engineHours?, annualHours?, fuelBurnLitresPerHour?, engineTypeId? } }`.
 * A re-forecast case (lib/db/queries/reforecast.ts) holds each truck's figures
 * derived from its readings here, so the register and every other case stay
 * as they are. Null: the case reads the register, as before.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.text('truckFigures').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.dropColumn('truckFigures');
  });
}
