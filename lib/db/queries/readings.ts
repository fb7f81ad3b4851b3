import 'server-only';
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { writeAudit } from '@/lib/audit';
import { insertReturningId } from '@/lib/api/crud';
import { conflict, invalid, notFound } from '@/lib/http';
import { deriveFigures, meterProblem, type DerivedFigures } from '@/lib/readings/derive';
import { nowIso } from '@/lib/time';
import { truckInputSchema } from '@/lib/validation/fleet';
import { readingProblems, type ReadingFields, type ReadingInput } from '@/lib/validation/readings';

type Row = Record<string, unknown>;
const stamp = (access: Access, now: string) => ({ updatedBy: access.userId, updatedAt: now });
const COLUMNS = [
  'r.id', 'r.truckId', 't.unitNumber', 'r.month', 'r.hourMeter', 'r.fuelLitres', 'r.tonnes', 'r.overhauls', 'r.failures', 'r.daysDown',
  'r.repowerDate', 'r.repowerCost', 'r.repowerEngineTypeId', 'e.key as repowerEngineKey', 'r.notes', 'r.version', 'r.updatedAt',
];
const asNumbers = (r: Row) => ({
  ...r,
  hourMeter: Number(r.hourMeter),
  fuelLitres: Number(r.fuelLitres),
  tonnes: r.tonnes === null ? null : Number(r.tonnes),
  daysDown: Number(r.daysDown),
  repowerCost: r.repowerCost === null ? null : Number(r.repowerCost),
});

/** The workspace's readings, by unit number and month; one truck's when `truckId` is given. */
export async function listReadings(k: Knex, workspaceId: number, truckId?: number): Promise<Row[]> {
  let q = k('truck_readings as r')
    .join('trucks as t', 't.id', 'r.truckId')
    .leftJoin('engine_types as e', 'e.id', 'r.repowerEngineTypeId')
    .where('r.workspaceId', workspaceId);
  if (truckId !== undefined) q = q.andWhere('r.truckId', truckId);
  return (await q.orderBy([{ column: 't.unitNumber' }, { column: 'r.month' }]).select(COLUMNS)).map(asNumbers);
}

export async function readReading(k: Knex, workspaceId: number, id: number): Promise<Row | null> {
  const row = await k('truck_readings as r')
    .join('trucks as t', 't.id', 'r.truckId')
    .leftJoin('engine_types as e', 'e.id', 'r.repowerEngineTypeId')
    .where({ 'r.workspaceId': workspaceId, 'r.id': id })
    .first(COLUMNS);
  return row ? asNumbers(row) : null;
}

/**
 * The checks one typed reading needs beyond its schema: the truck and engine
 * type belong to the workspace, nothing in the future, one reading per truck
 * and month, and the meter does not fall from the month before or above the
 * month after. 422 naming the field otherwise.
 */
async function checkReading(k: Knex, workspaceId: number, input: ReadingInput, exceptId?: number) {
  if (!(await k('trucks').where({ id: input.truckId, workspaceId }).first('id'))) {
    throw invalid([{ path: 'truckId', message: `must be a truck of this workspace (no such id: ${input.truckId})` }]);
  }
  if (input.repowerEngineTypeId !== null && !(await k('engine_types').where({ id: input.repowerEngineTypeId, workspaceId }).first('id'))) {
    throw invalid([{ path: 'repowerEngineTypeId', message: `must be an engine type of this workspace (no such id: ${input.repowerEngineTypeId})` }]);
  }
  const problems = readingProblems(input, new Date()).map((p) => ({ path: p.field, message: p.message }));
  if (problems.length) throw invalid(problems);
  const others = k('truck_readings').where({ workspaceId, truckId: input.truckId });
  if (exceptId !== undefined) others.whereNot({ id: exceptId });
  const rows = await others.select('id', 'month', 'hourMeter', 'repowerDate');
  if (rows.some((r) => r.month === input.month)) {
    throw invalid([{ path: 'month', message: `duplicate month: this truck already has a reading for ${input.month}; edit that one instead` }]);
  }
  const prev = rows.filter((r) => r.month < input.month).sort((a, b) => (a.month < b.month ? 1 : -1))[0];
  const next = rows.filter((r) => r.month > input.month).sort((a, b) => (a.month < b.month ? -1 : 1))[0];
  const low = meterProblem(prev ? { month: prev.month, hourMeter: Number(prev.hourMeter) } : null, input);
  if (low) throw invalid([{ path: 'hourMeter', message: low }]);
  const high = next ? meterProblem({ month: input.month, hourMeter: input.hourMeter }, { hourMeter: Number(next.hourMeter), repowerDate: next.repowerDate }) : null;
  if (high) throw invalid([{ path: 'hourMeter', message: `${input.hourMeter.toLocaleString('en-US')} h is higher than the reading of ${next.month} (${Number(next.hourMeter).toLocaleString('en-US')} h)` }]);
}

export async function createReading(trx: Knex.Transaction, access: Access, input: ReadingInput): Promise<number> {
  const wsId = access.workspace.id;
  await checkReading(trx, wsId, input);
  const now = nowIso();
  const id = await insertReturningId(trx, 'truck_readings', { workspaceId: wsId, ...input, version: 1, createdBy: access.userId, createdAt: now, ...stamp(access, now) });
  await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'create', entity: 'truck_reading', entityId: id, after: input });
  return id;
}

export async function updateReading(trx: Knex.Transaction, access: Access, id: number, version: number, input: ReadingInput): Promise<void> {
  const wsId = access.workspace.id;
  const before = await trx('truck_readings').where({ id, workspaceId: wsId }).first();
  if (!before) throw notFound('No such reading in this workspace.');
  if (before.version !== version) throw conflict();
  await checkReading(trx, wsId, input, id);
  const n = await trx('truck_readings').where({ id, workspaceId: wsId, version }).update({ ...input, version: version + 1, ...stamp(access, nowIso()) });
  if (n !== 1) throw conflict();
  await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'update', entity: 'truck_reading', entityId: id, before, after: input });
}

export async function deleteReading(trx: Knex.Transaction, access: Access, id: number, version: number): Promise<void> {
  const wsId = access.workspace.id;
  const before = await trx('truck_readings').where({ id, workspaceId: wsId }).first();
  if (!before) throw notFound('No such reading in this workspace.');
  if (before.version !== version) throw conflict();
  const n = await trx('truck_readings').where({ id, workspaceId: wsId, version }).delete();
  if (n !== 1) throw conflict();
  await writeAudit(trx, { workspaceId: wsId, userId: access.userId, action: 'delete', entity: 'truck_reading', entityId: id, before });
}

// ---------------------------------------------------------------- the register from readings

/** What "Use these figures" would write: the derived figures rounded as shown (whole hours, 0.1 L/h). */
export type Offer = { engineHours?: number; annualHours?: number; fuelBurnLitresPerHour?: number; engineTypeId?: number };

export function offerFrom(d: DerivedFigures): Offer {
  const o: Offer = { engineHours: Math.round(d.engineHours.value) };
  if (d.annualHours !== null) o.annualHours = Math.round(d.annualHours);
  if (d.fuelBurnLitresPerHour !== null) o.fuelBurnLitresPerHour = Math.round(d.fuelBurnLitresPerHour * 10) / 10;
  if (d.repower?.engineTypeId != null) o.engineTypeId = d.repower.engineTypeId;
  return o;
}

const TRUCK_FIGURES = ['id', 'unitNumber', 'engineTypeId', 'engineHours', 'annualHours', 'fuelBurnLitresPerHour', 'version'];

/** Every truck of the workspace with its register figures and, when it has readings, the figures derived over `windowMonths`. */
export async function listDerived(k: Knex, workspaceId: number, windowMonths: number) {
  const [trucks, readings, engines] = await Promise.all([
    k('trucks').where({ workspaceId }).orderBy('unitNumber').select(TRUCK_FIGURES),
    k('truck_readings').where({ workspaceId }).select('truckId', 'month', 'hourMeter', 'fuelLitres', 'overhauls', 'repowerDate', 'repowerEngineTypeId'),
    k('engine_types').where({ workspaceId }).select('id', 'key'),
  ]);
  const engineKey = new Map(engines.map((e) => [e.id, e.key as string]));
  const byTruck = new Map<number, typeof readings>();
  for (const r of readings) (byTruck.get(r.truckId) ?? byTruck.set(r.truckId, []).get(r.truckId)!).push({ ...r, hourMeter: Number(r.hourMeter), fuelLitres: Number(r.fuelLitres) });
  return trucks.map((t) => {
    const derived = deriveFigures(byTruck.get(t.id) ?? [], windowMonths);
    const offer = derived ? offerFrom(derived) : null;
    return {
      truck: {
        id: t.id, unitNumber: t.unitNumber, version: t.version, engineTypeId: t.engineTypeId, engineKey: engineKey.get(t.engineTypeId) ?? '',
        engineHours: Number(t.engineHours), annualHours: Number(t.annualHours), fuelBurnLitresPerHour: t.fuelBurnLitresPerHour === null ? null : Number(t.fuelBurnLitresPerHour),
      },
      readings: byTruck.get(t.id)?.length ?? 0,
      derived,
      offer: offer && { ...offer, engineKey: offer.engineTypeId !== undefined ? engineKey.get(offer.engineTypeId) ?? '' : undefined },
    };
  });
}

/**
 * "Use these figures": writes the chosen derived figures (derived again here,
 * over the window asked) to the truck, with the version the user loaded (409
 * when stale), checked by the truck schema (422), and audited with the
 * readings' date and window, in one transaction.
 */
export async function acceptDerived(
  trx: Knex.Transaction,
  access: Access,
  truckId: number,
  body: { version: number; windowMonths: number; fields: Array<keyof Offer> },
) {
  const wsId = access.workspace.id;
  const before = await trx('trucks').where({ id: truckId, workspaceId: wsId }).first();
  if (!before) throw notFound('No such truck in this workspace.');
  if (before.version !== body.version) throw conflict();
  const readings = await trx('truck_readings').where({ workspaceId: wsId, truckId }).select('month', 'hourMeter', 'fuelLitres', 'overhauls', 'repowerDate', 'repowerEngineTypeId');
  const derived = deriveFigures(readings.map((r) => ({ ...r, hourMeter: Number(r.hourMeter), fuelLitres: Number(r.fuelLitres) })), body.windowMonths);
  if (!derived) throw invalid([{ path: 'fields', message: 'this truck has no readings' }]);
  const offer = offerFrom(derived);
  const change: Row = {};
  const problems = [];
  for (const f of body.fields) {
    if (offer[f] === undefined) problems.push({ path: 'fields', message: `the readings give no ${f} (${f === 'engineTypeId' ? 'no repower with an engine type is recorded' : 'at least two readings are needed'})` });
    else change[f] = offer[f];
  }
  if (problems.length) throw invalid(problems);
  const { workspaceId: _w, id: _i, version: _v, createdBy: _cb, updatedBy: _ub, createdAt: _ca, updatedAt: _ua, ...current } = before;
  const next = truckInputSchema.safeParse({ ...current, ...change, engineHours: Number(change.engineHours ?? current.engineHours) });
  if (!next.success) throw invalid(next.error.issues.map((i) => ({ path: String(i.path[0]), message: `the derived ${String(i.path[0])} ${i.message}` })));
  const n = await trx('trucks').where({ id: truckId, workspaceId: wsId, version: body.version }).update({ ...change, version: body.version + 1, updatedBy: access.userId, updatedAt: nowIso() });
  if (n !== 1) throw conflict();
  await writeAudit(trx, {
    workspaceId: wsId,
    userId: access.userId,
    action: 'update',
    entity: 'truck',
    entityId: truckId,
    before: Object.fromEntries(Object.keys(change).map((f) => [f, before[f]])),
    after: { ...change, source: 'readings', asOf: derived.asOf, window: derived.window },
  });
  return { version: body.version + 1, changed: change };
}

export type { ReadingFields };

export { commitReadingsImport, loadReadingLookups } from '@/lib/readings/import-commit';
