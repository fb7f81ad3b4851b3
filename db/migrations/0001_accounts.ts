import type { Knex } from 'knex';

// Times are stored as ISO-8601 UTC text so SQLite and PostgreSQL read them back alike.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('users', (t) => {
    t.increments('id').primary();
    t.string('email', 320).notNullable().unique();
    t.string('name', 200).notNullable().defaultTo('');
    t.string('passwordHash', 100).notNullable();
    t.string('createdAt', 32).notNullable();
    t.string('updatedAt', 32).notNullable();
  });
  await knex.schema.createTable('workspaces', (t) => {
    t.increments('id').primary();
    t.string('slug', 80).notNullable().unique();
    t.string('name', 200).notNullable();
    t.string('currency', 3).notNullable().defaultTo('USD');
    // Display settings and defaults: units, negative style, approvals needed.
    t.text('settings').notNullable().defaultTo('{}');
    t.string('createdAt', 32).notNullable();
    t.string('updatedAt', 32).notNullable();
  });
  await knex.schema.createTable('memberships', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.integer('userId').notNullable().references('users.id').onDelete('CASCADE');
    t.string('role', 16).notNullable();
    t.string('createdAt', 32).notNullable();
    t.unique(['workspaceId', 'userId']);
  });
  await knex.schema.createTable('sign_in_attempts', (t) => {
    t.increments('id').primary();
    t.string('email', 320).notNullable();
    t.string('address', 64).notNullable();
    t.boolean('succeeded').notNullable();
    t.string('at', 32).notNullable();
    t.index(['email', 'address', 'at']);
    t.index(['address', 'at']);
  });
  await knex.schema.createTable('audit_log', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').nullable().references('workspaces.id').onDelete('CASCADE');
    t.integer('userId').nullable().references('users.id').onDelete('SET NULL');
    t.string('action', 64).notNullable();
    t.string('entity', 64).notNullable();
    t.string('entityId', 64).nullable();
    t.text('before').nullable();
    t.text('after').nullable();
    t.string('at', 32).notNullable();
    t.index(['workspaceId', 'at']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const t of ['audit_log', 'sign_in_attempts', 'memberships', 'workspaces', 'users']) {
    await knex.schema.dropTableIfExists(t);
  }
}
