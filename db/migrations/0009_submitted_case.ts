import type { Knex } from 'knex';

/**
 * business_cases.submittedCase: the validated case/1 (canonical JSON) as it was
 * submitted, so approvers decide on, and the final approval freezes, exactly
 * what was sent, whatever happens to the fleet meanwhile.
 * users.passwordChangedAt: when the password was last set by a reset or an
 * invitation; a session signed in before that moment no longer counts.
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('business_cases', (t) => {
    t.text('submittedCase').nullable();
  });
  await knex.schema.alterTable('users', (t) => {
    t.string('passwordChangedAt', 32).nullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.alterTable('users', (t) => {
    t.dropColumn('passwordChangedAt');
  });
  await knex.schema.alterTable('business_cases', (t) => {
    t.dropColumn('submittedCase');
  });
}
