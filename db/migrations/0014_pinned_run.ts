import type { Knex } from 'knex';

/**
 * business_cases.pinnedRunId: the Monte Carlo run an analyst pinned to the
 * case (lib/risk/runs.ts `pinRun`), the run whose figures the decision summary
 * quotes and the submission freezes with the case. Null: none pinned. A run is
 * deleted only with its case, so ON DELETE SET NULL is a safety net.
 */
/**
 * SQLite adds and drops a column that is a foreign key by copying the table,
 * and dropping the old `business_cases` with foreign keys on would cascade the
 * delete to every row that references it (runs, events, revisions). Knex turns
 * foreign keys off for the copy, but SQLite ignores that inside a transaction,
 * so this migration runs outside one (each table copy is its own transaction).
 */
export const config = { transaction: false };

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.string('pinnedRunId', 36).nullable().references('monte_carlo_runs.id').onDelete('SET NULL');
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.dropForeign(['pinnedRunId']);
  });
  await knex.schema.alterTable('business_cases', (t) => {
    t.dropColumn('pinnedRunId');
  });
}
