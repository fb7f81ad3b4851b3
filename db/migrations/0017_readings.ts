import type { Knex } from 'knex';

/**
 * Issue 20, readings: one row per truck and calendar month (`month` is
 * "YYYY-MM"), what the site recorded at the month's end:
 *
 * - `hourMeter` (h): the engine's hour meter at the month's end. It never
 *   falls, except in a month that records a repower (a new engine, a new meter).
 * - `fuelLitres` (L): fuel dispensed to the truck in the month.
 * - `tonnes` (t, nullable): tonnes hauled in the month, when known.
 * - events in the month: `overhauls` and `failures` (counts), `daysDown`
 *   (days out of service in the month for those events), and a repower done:
 *   `repowerDate` ("YYYY-MM-DD", inside the month), `repowerCost` (money) and
 *   `repowerEngineTypeId` (the engine fitted, nullable).
 *
 * The columns are what a later plan-against-actual needs per truck and month
 * (hours, litres, tonnes, event counts, days down, capital spent); the month
 * is text so both databases sort and compare it the same way.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('truck_readings', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.integer('truckId').notNullable().references('trucks.id').onDelete('CASCADE');
    t.string('month', 7).notNullable();
    t.double('hourMeter').notNullable();
    t.double('fuelLitres').notNullable();
    t.double('tonnes').nullable();
    t.integer('overhauls').notNullable().defaultTo(0);
    t.integer('failures').notNullable().defaultTo(0);
    t.double('daysDown').notNullable().defaultTo(0);
    t.string('repowerDate', 10).nullable();
    t.double('repowerCost').nullable();
    t.integer('repowerEngineTypeId').nullable().references('engine_types.id').onDelete('RESTRICT');
    t.text('notes').notNullable().defaultTo('');
    t.integer('version').notNullable().defaultTo(1);
    t.integer('createdBy').nullable().references('users.id').onDelete('SET NULL');
    t.integer('updatedBy').nullable().references('users.id').onDelete('SET NULL');
    t.string('createdAt', 32).notNullable();
    t.string('updatedAt', 32).notNullable();
    t.unique(['truckId', 'month']);
    t.index(['workspaceId', 'month']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTable('truck_readings');
}
