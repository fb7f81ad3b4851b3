import 'server-only';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { writeAudit } from '@/lib/audit';
import { insertReturningId } from '@/lib/api/crud';
import { nowIso } from '@/lib/time';
import type { CaseFile } from '@/lib/validation/case';
import { assumptionSetColumns } from '@/lib/db/assumption-columns';

type Row = Record<string, unknown>;
type Tally = { created: string[]; updated: string[] };

/**
 * Upserts one row by its workspace-unique column: an existing row is updated
 * (version bumped, previous values kept for the audit), a new one inserted.
 */
async function upsert(trx: Knex.Transaction, access: Access, table: string, keyCol: string, key: string, values: Row, extraOnCreate: Row, tally: Tally, before: Row[]) {
  const wsId = access.workspace.id;
  const now = nowIso();
  const old = await trx(table).where({ workspaceId: wsId, [keyCol]: key }).first();
  if (old) {
    before.push({ table, ...old });
    await trx(table).where({ id: old.id }).update({ ...values, version: old.version + 1, updatedBy: access.userId, updatedAt: now });
    tally.updated.push(key);
    return old.id as number;
  }
  const id = await insertReturningId(trx, table, {
    workspaceId: wsId, [keyCol]: key, ...extraOnCreate, ...values, version: 1, createdBy: access.userId, createdAt: now, updatedBy: access.userId, updatedAt: now,
  });
  tally.created.push(key);
  return id;
}

/**
 * Brings a validated case/1 file into a workspace in the caller's transaction:
 * engines and offers matched by key, trucks by unit number, the assumptions
 * stored as the set named like the case. Names, suppliers, payload classes and
 * notes that the case file does not carry are kept. An offer without
 * `failedCoreCredit` stores null (the core credit applies), also over a stored value.
 */
export async function importCaseFile(trx: Knex.Transaction, access: Access, c: CaseFile) {
  const before: Row[] = [];
  const engines: Tally = { created: [], updated: [] };
  const offers: Tally = { created: [], updated: [] };
  const trucks: Tally = { created: [], updated: [] };
  const sets: Tally = { created: [], updated: [] };
  const engineIds = new Map<string, number>();
  const offerIds = new Map<string, number>();
  for (const { id, ...fields } of c.engines) {
    engineIds.set(id, await upsert(trx, access, 'engine_types', 'key', id, fields, { name: id }, engines, before));
  }
  for (const { id, engineId, ...fields } of c.repowerOffers) {
    offerIds.set(id, await upsert(trx, access, 'repower_offers', 'key', id, { ...fields, failedCoreCredit: fields.failedCoreCredit ?? null, engineTypeId: engineIds.get(engineId) }, {}, offers, before));
  }
  for (const { id, engineId, repowerOfferId, ...fields } of c.trucks) {
    await upsert(trx, access, 'trucks', 'unitNumber', id, { ...fields, engineTypeId: engineIds.get(engineId), repowerOfferId: offerIds.get(repowerOfferId) ?? null }, {}, trucks, before);
  }
  await upsert(trx, access, 'assumption_sets', 'name', c.name, assumptionSetColumns(c.assumptions), {}, sets, before);
  const counts = { engines, repowerOffers: offers, trucks, assumptionSets: sets };
  await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'import', entity: 'case_file', entityId: null, before: before.length ? before : undefined, after: { name: c.name, ...counts } });
  return counts;
}
