import type { Knex } from 'knex';

/**
 * MODEL.md sections 5 and 11, and the failed swap of section 3:
 * assumption_sets.valuation ('expected' | 'median-path') and
 * assumption_sets.lostMarginShare (0..1) as columns with the model's defaults;
 * repower_offers.failedCoreCredit (money; null = the offer's coreCredit).
 * Numbers are double precision like every stored number (0002).
 *
 * Sets saved since the case schema learnt the two assumptions carry them in
 * their `assumptions` JSON; up() moves them into the columns (the columns are
 * the truth from here on) and down() puts them back.
 */
const KEYS = ['valuation', 'lostMarginShare'] as const;

export async function up(knex: Knex): Promise<void> {
  await knex.schema.alterTable('assumption_sets', (t) => {
    t.string('valuation', 16).notNullable().defaultTo('expected');
    t.double('lostMarginShare').notNullable().defaultTo(1);
  });
  await knex.schema.alterTable('repower_offers', (t) => {
    t.double('failedCoreCredit').nullable();
  });
  for (const row of await knex('assumption_sets').select('id', 'assumptions')) {
    const json = JSON.parse(String(row.assumptions)) as Record<string, unknown>;
    if (!KEYS.some((k) => k in json)) continue;
    const { valuation, lostMarginShare, ...rest } = json;
    await knex('assumption_sets').where({ id: row.id }).update({
      assumptions: JSON.stringify(rest),
      ...(typeof valuation === 'string' ? { valuation } : {}),
      ...(typeof lostMarginShare === 'number' ? { lostMarginShare } : {}),
    });
  }
}

export async function down(knex: Knex): Promise<void> {
  for (const row of await knex('assumption_sets').select('id', 'assumptions', 'valuation', 'lostMarginShare')) {
    const json = JSON.parse(String(row.assumptions)) as Record<string, unknown>;
    await knex('assumption_sets').where({ id: row.id }).update({
      assumptions: JSON.stringify({ ...json, valuation: row.valuation, lostMarginShare: Number(row.lostMarginShare) }),
    });
  }
  await knex.schema.alterTable('repower_offers', (t) => {
    t.dropColumn('failedCoreCredit');
  });
  await knex.schema.alterTable('assumption_sets', (t) => {
    t.dropColumn('lostMarginShare');
    t.dropColumn('valuation');
  });
}
