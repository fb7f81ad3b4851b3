import type { Knex } from 'knex';

/**
 * Outgoing mail, written in the same transaction as the change that causes it
 * (a submission, a decision, an invitation, a reset request) and sent from
 * here afterwards (lib/mail/queue.ts), so a process that dies after the commit
 * loses no mail. status: pending → sending (claimed, until nextAttemptAt) →
 * sent | pending again (retry with back-off) | failed (attempts used up).
 */
export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('mail_outbox', (t) => {
    t.increments('id').primary();
    // slug for the X-Haulcase-Workspace header; null for account mail (password reset)
    t.string('workspaceSlug', 80).nullable();
    t.text('toAddresses').notNullable(); // JSON array of recipients
    t.string('subject', 500).notNullable();
    t.text('text').notNullable();
    t.text('html').notNullable();
    t.string('status', 16).notNullable().defaultTo('pending');
    t.integer('attempts').notNullable().defaultTo(0);
    // when the next attempt is due; while sending, when the claim lapses
    t.string('nextAttemptAt', 32).notNullable();
    t.string('lastError', 1000).nullable();
    t.string('createdAt', 32).notNullable();
    t.string('sentAt', 32).nullable();
    t.index(['status', 'nextAttemptAt']);
  });
}

export async function down(knex: Knex): Promise<void> {
  await knex.schema.dropTableIfExists('mail_outbox');
}
