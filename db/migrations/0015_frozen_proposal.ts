import type { Knex } from 'knex';

/**
 * business_cases.frozenRecord: the whole record an approval froze, as one
 * canonical JSON text (lib/approvals/freeze.ts, `frozen-record/1`): the case
 * file, its result, the proposal (plan settings, chosen trucks, capital plan,
 * swap schedule), its decision summary and the pinned Monte Carlo run.
 * `frozenHash` is the SHA-256 of exactly these bytes, and the download serves
 * them. Null for cases approved before it existed: their hash stays over
 * `frozenCase + "\n" + frozenResult`.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.text('frozenRecord').nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.dropColumn('frozenRecord');
  });
}
