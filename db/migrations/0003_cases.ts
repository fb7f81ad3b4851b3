import type { Knex } from 'knex';

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('business_cases', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.string('name', 200).notNullable();
    t.integer('assumptionSetId').nullable().references('assumption_sets.id').onDelete('SET NULL');
    // JSON: [{ truckId, repowerOfferId|null }] — the offer per truck, null = the truck's own.
    t.text('selection').notNullable().defaultTo('[]');
    // JSON: { budgets: { [year]: amount }, swapsPerMonth, startMonth } for the capital plan.
    t.text('plan').notNullable().defaultTo('{}');
    t.string('status', 16).notNullable().defaultTo('draft'); // draft | submitted | approved | rejected | returned
    t.integer('revisionOf').nullable().references('business_cases.id').onDelete('SET NULL');
    // Frozen on approval: exact case/1 and case-result/1 JSON and a SHA-256 of both.
    t.text('frozenCase').nullable();
    t.text('frozenResult').nullable();
    t.string('frozenHash', 64).nullable();
    t.string('submittedAt', 32).nullable();
    t.integer('submittedBy').nullable().references('users.id').onDelete('SET NULL');
    t.string('decidedAt', 32).nullable();
    t.integer('version').notNullable().defaultTo(1);
    t.integer('createdBy').nullable().references('users.id').onDelete('SET NULL');
    t.integer('updatedBy').nullable().references('users.id').onDelete('SET NULL');
    t.string('createdAt', 32).notNullable();
    t.string('updatedAt', 32).notNullable();
  });
  await knex.schema.createTable('case_events', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.integer('caseId').notNullable().references('business_cases.id').onDelete('CASCADE');
    t.integer('userId').nullable().references('users.id').onDelete('SET NULL');
    t.string('action', 24).notNullable(); // submit | approve | reject | return | comment
    t.text('comment').notNullable().defaultTo('');
    t.string('at', 32).notNullable();
    t.index(['caseId', 'at']);
  });
  await knex.schema.createTable('invitations', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.string('email', 320).notNullable();
    t.string('role', 16).notNullable();
    t.string('tokenHash', 64).notNullable().unique();
    t.string('expiresAt', 32).notNullable();
    t.string('usedAt', 32).nullable();
    t.integer('invitedBy').nullable().references('users.id').onDelete('SET NULL');
    t.string('createdAt', 32).notNullable();
  });
  await knex.schema.createTable('password_resets', (t) => {
    t.increments('id').primary();
    t.integer('userId').notNullable().references('users.id').onDelete('CASCADE');
    t.string('tokenHash', 64).notNullable().unique();
    t.string('expiresAt', 32).notNullable();
    t.string('usedAt', 32).nullable();
    t.string('createdAt', 32).notNullable();
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const t of ['password_resets', 'invitations', 'case_events', 'business_cases']) {
    await knex.schema.dropTableIfExists(t);
  }
}
