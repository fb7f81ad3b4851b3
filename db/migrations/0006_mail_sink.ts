import type { Knex } from 'knex';

// Messages received by the local SMTP sink (development, demo, tests). Kept in the
// database rather than in memory so any app process can list what any other received.
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mail_sink', (t) => {
    t.increments('id').primary();
    // Slug from our X-Haulcase-Workspace header; null for account mail (password reset).
    t.string('workspaceSlug', 80).nullable();
    t.string('fromAddress', 320).notNullable().defaultTo('');
    t.text('toAddresses').notNullable().defaultTo('[]'); // JSON array of envelope recipients
    t.string('subject', 500).notNullable().defaultTo('');
    t.text('text').notNullable().defaultTo('');
    t.text('html').notNullable().defaultTo('');
    t.string('receivedAt', 32).notNullable();
    t.index(['workspaceSlug', 'receivedAt']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('mail_sink');
}
