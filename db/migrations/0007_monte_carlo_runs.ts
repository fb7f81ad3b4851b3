import type { Knex } from 'knex';

/**
 * Monte Carlo runs of a business case. The run itself lives in worker threads
 * of one app server; this row keeps what it was asked and what it found, so
 * the result outlives the process and any server can show it.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('monte_carlo_runs', (t) => {
    t.string('id', 36).primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.integer('caseId').notNullable().references('business_cases.id').onDelete('CASCADE');
    // JSON: { iterations, seed, sampleFailures, distributions: [{ driver, distribution }] }
    t.text('spec').notNullable();
    t.string('status', 16).notNullable(); // running | done | cancelled | timed-out | failed
    t.integer('iterations').notNullable();
    t.integer('done').notNullable().defaultTo(0);
    // JSON MonteCarloResult (lib/engine/monte-carlo/stats.ts), once finished
    t.text('result').nullable();
    t.string('error', 500).nullable();
    t.integer('createdBy').nullable().references('users.id').onDelete('SET NULL');
    t.string('createdAt', 32).notNullable();
    t.string('finishedAt', 32).nullable();
    t.index(['caseId', 'createdAt']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('monte_carlo_runs');
}
