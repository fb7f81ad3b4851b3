import 'server-only';
import type { Knex } from 'knex';
import { writeAudit } from '@/lib/audit';
import type { Access } from '@/lib/auth/access';
import { conflict, invalid, notFound, type Problem } from '@/lib/http';
import { nowIso } from '@/lib/time';
import { readEngineLives, readPlanSettings, readTruckFigures, type CreateCaseInput, type EngineLives, type PlanSettings, type Selection, type TruckFigures, type UpdateCaseInput } from '@/lib/validation/business-case';
import { db } from '../index';

export type CaseRow = {
  id: number;
  name: string;
  assumptionSetId: number | null;
  assumptionSetName: string | null;
  selection: Selection;
  plan: PlanSettings;
  /** the case's own figures per truck row id in place of the register's (a re-forecast case); {} = the register's */
  truckFigures: TruckFigures;
  /** planned overhaul life by engine type row id, in place of the library's (migration 0019); {} when none */
  engineLives: EngineLives;
  status: string;
  version: number;
  /** canonical case/1 JSON frozen on approval, or null */
  frozenCase: string | null;
  /** canonical case/1 JSON stored at submission (cleared when sent back), or null */
  submittedCase: string | null;
  createdAt: string;
  updatedAt: string;
};

type Raw = Record<string, any>;

function toCase(r: Raw): CaseRow {
  return {
    id: r.id,
    name: r.name,
    assumptionSetId: r.assumptionSetId,
    assumptionSetName: r.assumptionSetName ?? null,
    selection: JSON.parse(r.selection || '[]'),
    plan: readPlanSettings(r.plan, r.createdAt),
    truckFigures: readTruckFigures(r.truckFigures),
    engineLives: readEngineLives(r.engineLives),
    status: r.status,
    version: r.version,
    frozenCase: r.frozenCase ?? null,
    submittedCase: r.submittedCase ?? null,
    createdAt: r.createdAt,
    updatedAt: r.updatedAt,
  };
}

const withSetName = (k: Knex, workspaceId: number) =>
  k('business_cases as c')
    .leftJoin('assumption_sets as s', 's.id', 'c.assumptionSetId')
    .where('c.workspaceId', workspaceId)
    .select('c.*', 's.name as assumptionSetName');

export async function listCases(workspaceId: number): Promise<CaseRow[]> {
  return (await withSetName(db(), workspaceId).orderBy('c.updatedAt', 'desc').orderBy('c.id', 'desc')).map(toCase);
}

/** A case of this workspace, or null (another workspace's id is simply not found). */
export async function fetchCase(workspaceId: number, id: number, k: Knex = db()): Promise<CaseRow | null> {
  const r = await withSetName(k, workspaceId).andWhere('c.id', id).first();
  return r ? toCase(r) : null;
}

/**
 * What the create form offers: assumption sets, trucks with their own offer
 * and the rated power of the engine fitted today, offers with the rated power
 * of the engine they fit (the form warns where the two are far apart).
 */
export async function fetchCaseFormOptions(workspaceId: number) {
  const k = db();
  const [assumptionSets, trucks, offers] = await Promise.all([
    k('assumption_sets').where({ workspaceId }).orderBy('name').select('id', 'name'),
    k('trucks as t')
      .leftJoin('engine_types as e', 'e.id', 't.engineTypeId')
      .where('t.workspaceId', workspaceId)
      .orderBy('t.unitNumber')
      .select('t.id', 't.unitNumber', 't.payloadClass', 't.repowerOfferId', 't.engineHours', 't.annualHours', 'e.ratedKw as engineKw'),
    k('repower_offers as o')
      .leftJoin('engine_types as e', 'e.id', 'o.engineTypeId')
      .where('o.workspaceId', workspaceId)
      .orderBy('o.key')
      .select('o.id', 'o.key', 'o.supplier', 'e.ratedKw as ratedKw'),
  ]);
  const kw = (v: unknown) => (v === null || v === undefined ? null : Number(v));
  return {
    assumptionSets,
    trucks: trucks.map((t) => ({ ...t, engineKw: kw(t.engineKw) })),
    offers: offers.map((o) => ({ ...o, ratedKw: kw(o.ratedKw) })),
  };
}

/** Every id a case names must belong to the workspace; each stranger is one problem with its path. */
async function checkReferences(k: Knex, workspaceId: number, input: { assumptionSetId?: number; selection?: Selection; engineLives?: EngineLives }) {
  const problems: Problem[] = [];
  if (input.assumptionSetId !== undefined) {
    const set = await k('assumption_sets').where({ workspaceId, id: input.assumptionSetId }).first('id');
    if (!set) problems.push({ path: 'assumptionSetId', message: 'is not an assumption set of this workspace' });
  }
  if (input.selection) {
    const truckIds = new Set((await k('trucks').where({ workspaceId }).select('id')).map((r) => r.id));
    const offerIds = new Set((await k('repower_offers').where({ workspaceId }).select('id')).map((r) => r.id));
    input.selection.forEach((s, i) => {
      if (!truckIds.has(s.truckId)) problems.push({ path: `selection[${i}].truckId`, message: 'is not a truck of this workspace' });
      if (s.repowerOfferId !== null && !offerIds.has(s.repowerOfferId)) problems.push({ path: `selection[${i}].repowerOfferId`, message: 'is not a repower offer of this workspace' });
    });
  }
  if (input.engineLives) {
    const engineIds = new Set((await k('engine_types').where({ workspaceId }).select('id')).map((r) => String(r.id)));
    for (const id of Object.keys(input.engineLives)) {
      if (!engineIds.has(id)) problems.push({ path: `engineLives.${id}`, message: 'is not an engine type of this workspace' });
    }
  }
  if (problems.length) throw invalid(problems);
}

const snapshot = (c: CaseRow) => ({ name: c.name, assumptionSetId: c.assumptionSetId, selection: c.selection, plan: c.plan, engineLives: c.engineLives, status: c.status, version: c.version });
/** The stored form of a case's engine-life overrides: null when it has none. */
const storedEngineLives = (m: EngineLives) => (Object.keys(m).length ? JSON.stringify(m) : null);

export async function createCase(access: Access, input: CreateCaseInput): Promise<CaseRow> {
  const wsId = access.workspace.id;
  return db().transaction(async (trx) => {
    await checkReferences(trx, wsId, input);
    const now = nowIso();
    const [row] = await trx('business_cases')
      .insert({ workspaceId: wsId, name: input.name, assumptionSetId: input.assumptionSetId, selection: JSON.stringify(input.selection), plan: '{}', status: 'draft', version: 1, createdBy: access.userId, updatedBy: access.userId, createdAt: now, updatedAt: now })
      .returning('id');
    const created = (await fetchCase(wsId, typeof row === 'object' ? row.id : row, trx)) as CaseRow;
    await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'create', entity: 'business_case', entityId: created.id, after: snapshot(created) });
    return created;
  });
}

/** A draft, or a case sent back for changes, is open to edits; submitted, approved and rejected cases are not. */
const EDITABLE = new Set(['draft', 'returned']);

/** Loads the case for a change: 404 if not here, 409 if the version is stale or the case is not open to edits. */
async function lockForChange(trx: Knex.Transaction, workspaceId: number, id: number, version: number): Promise<CaseRow> {
  const current = await fetchCase(workspaceId, id, trx);
  if (!current) throw notFound('No such business case in this workspace.');
  if (!EDITABLE.has(current.status)) {
    throw conflict(`This case is ${current.status}; only a draft or a case sent back for changes can be changed. Copy it to work on it.`);
  }
  if (current.version !== version) throw conflict();
  return current;
}

export async function updateCase(access: Access, id: number, input: UpdateCaseInput): Promise<CaseRow> {
  const wsId = access.workspace.id;
  return db().transaction(async (trx) => {
    const before = await lockForChange(trx, wsId, id, input.version);
    await checkReferences(trx, wsId, input);
    const patch: Raw = { version: before.version + 1, updatedBy: access.userId, updatedAt: nowIso() };
    if (input.name !== undefined) patch.name = input.name;
    if (input.assumptionSetId !== undefined) patch.assumptionSetId = input.assumptionSetId;
    if (input.selection !== undefined) patch.selection = JSON.stringify(input.selection);
    if (input.plan !== undefined) patch.plan = JSON.stringify(input.plan);
    if (input.engineLives !== undefined) patch.engineLives = storedEngineLives(input.engineLives);
    // the version in the WHERE makes a concurrent writer lose cleanly
    const n = await trx('business_cases').where({ id, workspaceId: wsId, version: before.version }).update(patch);
    if (n !== 1) throw conflict();
    const after = (await fetchCase(wsId, id, trx)) as CaseRow;
    const only = (field: keyof UpdateCaseInput) => input[field] !== undefined && Object.keys(input).length === 2;
    const action = only('plan') ? 'update-plan' : only('name') ? 'rename' : only('engineLives') ? 'update-engine-lives' : 'update';
    await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action, entity: 'business_case', entityId: id, before: snapshot(before), after: snapshot(after) });
    return after;
  });
}

export async function copyCase(access: Access, id: number, name?: string): Promise<CaseRow> {
  const wsId = access.workspace.id;
  return db().transaction(async (trx) => {
    const src = await fetchCase(wsId, id, trx);
    if (!src) throw notFound('No such business case in this workspace.');
    const now = nowIso();
    const [row] = await trx('business_cases')
      .insert({ workspaceId: wsId, name: name ?? `${src.name} (copy)`.slice(0, 200), assumptionSetId: src.assumptionSetId, selection: JSON.stringify(src.selection), plan: JSON.stringify(src.plan), truckFigures: Object.keys(src.truckFigures).length ? JSON.stringify(src.truckFigures) : null, engineLives: storedEngineLives(src.engineLives), status: 'draft', version: 1, createdBy: access.userId, updatedBy: access.userId, createdAt: now, updatedAt: now })
      .returning('id');
    const created = (await fetchCase(wsId, typeof row === 'object' ? row.id : row, trx)) as CaseRow;
    await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'copy', entity: 'business_case', entityId: created.id, before: { copiedFrom: id }, after: snapshot(created) });
    return created;
  });
}

export async function deleteCase(access: Access, id: number, version: number): Promise<void> {
  const wsId = access.workspace.id;
  await db().transaction(async (trx) => {
    const before = await lockForChange(trx, wsId, id, version);
    await trx('business_cases').where({ id, workspaceId: wsId }).delete();
    await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'delete', entity: 'business_case', entityId: id, before: snapshot(before) });
  });
}
