import 'server-only';
import type { Knex } from 'knex';
import type { EntityConfig } from '@/lib/api/crud';
import { conflict, invalid } from '@/lib/http';
import {
  assumptionSetInputSchema, assumptionSetUpdateSchema, engineInputSchema, engineUpdateSchema,
  offerInputSchema, offerUpdateSchema, truckInputSchema, truckUpdateSchema,
} from '@/lib/validation/fleet';
import { assumptionSetColumns, assumptionsOfRow } from '@/lib/db/assumption-columns';

type Row = Record<string, unknown>;

// The API never shows which workspace a row belongs to; the URL already says it.
const clean = ({ workspaceId: _w, ...rest }: Row) => rest;

async function assertOwned(k: Knex, table: string, workspaceId: number, id: unknown, path: string, what: string) {
  if (id === null || id === undefined) return;
  if (!(await k(table).where({ id, workspaceId }).first('id'))) {
    throw invalid([{ path, message: `must be ${what} of this workspace (no such id: ${String(id)})` }]);
  }
}

async function countUses(k: Knex, table: string, where: Row): Promise<number> {
  const [r] = await k(table).where(where).count<{ n: string | number }[]>({ n: '*' });
  return Number(r.n);
}

// ---------------------------------------------------------------- trucks

const listNames = (names: string[]) => (names.length > 3 ? `${names.slice(0, 3).join(', ')} and ${names.length - 3} more` : names.join(', '));

/**
 * A truck named by a case still being worked on or decided (draft, returned,
 * submitted) would drop out of it, so the delete is refused (409) and says which
 * cases. Approved cases keep their own frozen copy; rejected ones are closed.
 */
async function refuseTruckInUse(k: Knex, ws: number, id: number) {
  const casesUsing = (await k('business_cases').where({ workspaceId: ws }).whereIn('status', ['draft', 'returned', 'submitted']).orderBy('name').select('name', 'selection'))
    .filter((c) => (JSON.parse(c.selection || '[]') as Array<{ truckId: number }>).some((s) => s.truckId === id))
    .map((c) => `“${c.name}”`);
  if (!casesUsing.length) return;
  throw conflict(`This truck is still named by ${casesUsing.length} business case(s) (${listNames(casesUsing)}); take it out of them first. Nothing was deleted.`);
}

const truckQuery = (k: Knex, workspaceId: number) =>
  k('trucks as t')
    .leftJoin('engine_types as e', 'e.id', 't.engineTypeId')
    .leftJoin('repower_offers as o', 'o.id', 't.repowerOfferId')
    .where('t.workspaceId', workspaceId)
    .select('t.*', 'e.key as engineKey', 'o.key as offerKey');

export async function listTrucks(k: Knex, workspaceId: number) {
  return (await truckQuery(k, workspaceId).orderBy('t.unitNumber')).map(clean);
}

export const trucks: EntityConfig = {
  table: 'trucks',
  entity: 'truck',
  label: 'truck',
  createSchema: truckInputSchema,
  updateSchema: truckUpdateSchema,
  uniqueField: 'unitNumber',
  list: listTrucks,
  read: async (k, ws, id) => {
    const r = await truckQuery(k, ws).where('t.id', id).first();
    return r ? clean(r) : null;
  },
  toRow: async (k, ws, input) => {
    await assertOwned(k, 'engine_types', ws, input.engineTypeId, 'engineTypeId', 'an engine type');
    await assertOwned(k, 'repower_offers', ws, input.repowerOfferId, 'repowerOfferId', 'a repower offer');
    return input;
  },
  beforeDelete: refuseTruckInUse,
};

// ---------------------------------------------------------------- engine types

export const engines: EntityConfig = {
  table: 'engine_types',
  entity: 'engine_type',
  label: 'engine type',
  createSchema: engineInputSchema,
  updateSchema: engineUpdateSchema,
  uniqueField: 'key',
  list: async (k, ws) => (await k('engine_types').where({ workspaceId: ws }).orderBy('key')).map(clean),
  read: async (k, ws, id) => {
    const r = await k('engine_types').where({ id, workspaceId: ws }).first();
    return r ? clean(r) : null;
  },
  toRow: async (_k, _ws, input) => input,
  beforeDelete: async (k, ws, id) => {
    const t = await countUses(k, 'trucks', { workspaceId: ws, engineTypeId: id });
    const o = await countUses(k, 'repower_offers', { workspaceId: ws, engineTypeId: id });
    if (t + o > 0) throw conflict(`This engine type is used by ${t} truck(s) and ${o} repower offer(s); change those first.`);
  },
};

// ---------------------------------------------------------------- repower offers

const offerQuery = (k: Knex, ws: number) =>
  k('repower_offers as o')
    .leftJoin('engine_types as e', 'e.id', 'o.engineTypeId')
    .where('o.workspaceId', ws)
    .select('o.*', 'e.key as engineKey');

/**
 * An offer still named by a truck or by a case that is not frozen would leave
 * those without an offer (the schema would quietly null the trucks'), so the
 * delete is refused (409) and says who still uses it.
 */
async function refuseOfferInUse(k: Knex, ws: number, id: number) {
  const trucksUsing = (await k('trucks').where({ workspaceId: ws, repowerOfferId: id }).orderBy('unitNumber').select('unitNumber')).map((r) => String(r.unitNumber));
  const casesUsing = (await k('business_cases').where({ workspaceId: ws }).whereNull('frozenCase').select('name', 'selection'))
    .filter((c) => (JSON.parse(c.selection || '[]') as Array<{ repowerOfferId: number | null }>).some((s) => s.repowerOfferId === id))
    .map((c) => `“${c.name}”`);
  if (!trucksUsing.length && !casesUsing.length) return;
  const parts = [
    trucksUsing.length ? `${trucksUsing.length} truck(s) (${listNames(trucksUsing)})` : '',
    casesUsing.length ? `${casesUsing.length} business case(s) (${listNames(casesUsing)})` : '',
  ].filter(Boolean);
  throw conflict(`This repower offer is still named by ${parts.join(' and ')}; give them another offer first. Nothing was deleted.`);
}

export const offers: EntityConfig = {
  table: 'repower_offers',
  entity: 'repower_offer',
  label: 'repower offer',
  createSchema: offerInputSchema,
  updateSchema: offerUpdateSchema,
  uniqueField: 'key',
  list: async (k, ws) => (await offerQuery(k, ws).orderBy('o.key')).map(clean),
  read: async (k, ws, id) => {
    const r = await offerQuery(k, ws).where('o.id', id).first();
    return r ? clean(r) : null;
  },
  toRow: async (k, ws, input) => {
    await assertOwned(k, 'engine_types', ws, input.engineTypeId, 'engineTypeId', 'an engine type');
    return input;
  },
  beforeDelete: refuseOfferInUse,
  // The documents' rows cascade with the offer; their bytes are removed after the commit.
  storedFiles: async (k, ws, id) => (await k('quote_documents').where({ workspaceId: ws, offerId: id }).select('storageKey')).map((r) => r.storageKey as string),
};

// ---------------------------------------------------------------- assumption sets

// valuation and lostMarginShare are columns (migration 0013) shown inside `assumptions`, as in the case file.
const parseSet = (r: Row) => {
  const { valuation: _v, lostMarginShare: _l, ...rest } = clean(r);
  return { ...rest, assumptions: assumptionsOfRow(r) };
};

export const assumptionSets: EntityConfig = {
  table: 'assumption_sets',
  entity: 'assumption_set',
  label: 'assumption set',
  createSchema: assumptionSetInputSchema,
  updateSchema: assumptionSetUpdateSchema,
  uniqueField: 'name',
  list: async (k, ws) => (await k('assumption_sets').where({ workspaceId: ws }).orderBy('id')).map(parseSet),
  read: async (k, ws, id) => {
    const r = await k('assumption_sets').where({ id, workspaceId: ws }).first();
    return r ? parseSet(r) : null;
  },
  toRow: async (_k, _ws, input) => ({ ...input, ...assumptionSetColumns(input.assumptions as Row) }),
  beforeDelete: async (k, ws, id) => {
    const n = await countUses(k, 'business_cases', { workspaceId: ws, assumptionSetId: id });
    if (n > 0) throw conflict(`This assumption set is used by ${n} business case(s); it cannot be deleted.`);
  },
};
