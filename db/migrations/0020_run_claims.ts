import type { Knex } from 'knex';

/**
 * Monte Carlo runs on the PostgreSQL job queue (lib/risk/backends/queue.ts):
 * one row per queued run, beside its `monte_carlo_runs` row, that any server
 * reads and writes.
 *
 * - `attempt`: 0 while queued; each server that takes the run counts it up
 *   (a retry after the queue's expiry takes attempt 2), and writes progress and
 *   the result only while the attempt is still its own, so a server that lost
 *   the run never writes over the one that has it.
 * - `server`: which server holds the current attempt (host and process), for
 *   the logs and an operator; `claimedAt`, `heartbeatAt`: when it took the run
 *   and last wrote progress.
 * - `cancelRequested`: set by a cancel on any server; the holder reads it with
 *   each progress write and stops its workers.
 *
 * A new table rather than columns on `monte_carlo_runs`: SQLite would copy
 * that table to drop them, and `business_cases.pinnedRunId` points at it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('monte_carlo_run_claims', (t) => {
    t.string('runId', 36).primary().references('monte_carlo_runs.id').onDelete('CASCADE');
    t.integer('attempt').notNullable().defaultTo(0);
    t.string('server', 200).nullable();
    t.boolean('cancelRequested').notNullable().defaultTo(false);
    t.string('claimedAt', 32).nullable();
    t.string('heartbeatAt', 32).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('monte_carlo_run_claims');
}
