import type { Knex } from 'knex';

// Column names follow the case file (MODEL.md section 10) so a row maps to it directly.
// Numbers are double precision: what the user typed comes back as typed, never as cents.
function audited(t: Knex.CreateTableBuilder) {
  t.integer('version').notNullable().defaultTo(1);
  t.integer('createdBy').nullable().references('users.id').onDelete('SET NULL');
  t.integer('updatedBy').nullable().references('users.id').onDelete('SET NULL');
  t.string('createdAt', 32).notNullable();
  t.string('updatedAt', 32).notNullable();
}

export async function up(knex: Knex): Promise<void> {
  await knex.schema.createTable('engine_types', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.string('key', 80).notNullable(); // the engine id in a case file
    t.string('name', 200).notNullable().defaultTo('');
    for (const c of [
      'ratedKw', 'bsfcGPerKwh', 'lifeHours', 'weibullShape', 'weibullScaleHours',
      'overhaulCost', 'overhaulDowntimeDays', 'failureCost', 'failureDowntimeDays',
      'serviceIntervalHours', 'sumpLitres', 'serviceKitCost', 'serviceLabourHours', 'topUpLitresPerHour',
    ]) t.double(c).notNullable();
    t.text('notes').notNullable().defaultTo('');
    audited(t);
    t.unique(['workspaceId', 'key']);
  });
  await knex.schema.createTable('repower_offers', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.string('key', 80).notNullable(); // the offer id in a case file
    t.string('supplier', 200).notNullable().defaultTo('');
    t.integer('engineTypeId').notNullable().references('engine_types.id').onDelete('RESTRICT');
    for (const c of ['modulePrice', 'installCost', 'coreCredit', 'downtimeDays', 'productivityGain']) {
      t.double(c).notNullable();
    }
    t.string('timing', 16).notNullable().defaultTo('at-overhaul');
    t.text('notes').notNullable().defaultTo('');
    audited(t);
    t.unique(['workspaceId', 'key']);
  });
  await knex.schema.createTable('quote_documents', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.integer('offerId').notNullable().references('repower_offers.id').onDelete('CASCADE');
    t.string('fileName', 255).notNullable();
    t.string('contentType', 100).notNullable();
    t.integer('size').notNullable();
    t.string('storageKey', 255).notNullable();
    t.integer('uploadedBy').nullable().references('users.id').onDelete('SET NULL');
    t.string('createdAt', 32).notNullable();
  });
  await knex.schema.createTable('trucks', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.string('unitNumber', 80).notNullable(); // the truck id in a case file
    t.string('payloadClass', 40).notNullable().defaultTo('');
    t.integer('engineTypeId').notNullable().references('engine_types.id').onDelete('RESTRICT');
    t.integer('repowerOfferId').nullable().references('repower_offers.id').onDelete('SET NULL');
    for (const c of ['engineHours', 'remainingLifeHours', 'annualHours', 'loadFactor', 'tonnesPerHour']) {
      t.double(c).notNullable();
    }
    t.double('fuelBurnLitresPerHour').nullable();
    t.text('notes').notNullable().defaultTo('');
    audited(t);
    t.unique(['workspaceId', 'unitNumber']);
  });
  await knex.schema.createTable('assumption_sets', (t) => {
    t.increments('id').primary();
    t.integer('workspaceId').notNullable().references('workspaces.id').onDelete('CASCADE');
    t.string('name', 120).notNullable();
    t.text('assumptions').notNullable(); // JSON: the case file's `assumptions` object
    t.text('notes').notNullable().defaultTo('');
    audited(t);
    t.unique(['workspaceId', 'name']);
  });
}

export async function down(knex: Knex): Promise<void> {
  for (const t of ['assumption_sets', 'trucks', 'quote_documents', 'repower_offers', 'engine_types']) {
    await knex.schema.dropTableIfExists(t);
  }
}
