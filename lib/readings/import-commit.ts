/** The readings import's database side (no Next), beside lib/import/fleet-import.ts: the lookups a plan needs, and the commit. */
import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { writeAudit } from '@/lib/audit';
import { nowIso } from '@/lib/time';
import type { ReadingImportPlan, ReadingLookups } from './import-plan';

type Row = Record<string, unknown>;
export async function loadReadingLookups(k: Knex, workspaceId: number): Promise<ReadingLookups> {
  // One after another: inside a transaction there is one connection.
  const trucks = await k('trucks').where({ workspaceId }).select('id', 'unitNumber');
  const engines = await k('engine_types').where({ workspaceId }).select('id', 'key');
  const saved = await k('truck_readings').where({ workspaceId }).select('id', 'truckId', 'month', 'hourMeter', 'repowerDate');
  return {
    trucks: new Map(trucks.map((t) => [t.unitNumber, t.id])),
    engines: new Map(engines.map((e) => [e.key, e.id])),
    saved: saved.map((s) => ({ ...s, hourMeter: Number(s.hourMeter) })),
  };
}

const stamp = (access: Access, now: string) => ({ updatedBy: access.userId, updatedAt: now });

/**
 * Writes an import plan without problems in the caller's transaction: new
 * readings inserted, replaced ones updated with their version bumped, and one
 * audit row naming the file, what was created and what was replaced (with the
 * values it replaced).
 */
export async function commitReadingsImport(trx: Knex.Transaction, access: Access, plan: ReadingImportPlan, fileName: string) {
  if (plan.problems.length) throw new Error('commitReadingsImport called with problems');
  const wsId = access.workspace.id;
  const now = nowIso();
  const creates = plan.rows.filter((r) => r.action === 'create');
  const replaces = plan.rows.filter((r) => r.action === 'replace');
  await trx.batchInsert(
    'truck_readings',
    creates.map((r) => ({ workspaceId: wsId, truckId: r.truckId, ...r.input, version: 1, createdBy: access.userId, createdAt: now, ...stamp(access, now) })),
    200,
  );
  const before: Row[] = [];
  for (const r of replaces) {
    const { workspaceId: _w, ...old } = await trx('truck_readings').where({ id: r.replaces, workspaceId: wsId }).first();
    before.push(old);
    await trx('truck_readings').where({ id: r.replaces, workspaceId: wsId }).update({ ...r.input, version: trx.raw('version + 1'), ...stamp(access, now) });
  }
  await writeAudit(trx, {
    workspaceId: wsId,
    userId: access.userId,
    action: 'import',
    entity: 'truck_reading',
    entityId: null,
    before: replaces.length ? before : undefined,
    after: {
      fileName,
      created: creates.map((r) => `${r.unitNumber} ${r.input.month}`),
      replaced: replaces.map((r) => `${r.unitNumber} ${r.input.month}`),
      rows: plan.rows.map((r) => ({ unitNumber: r.unitNumber, ...r.input })),
    },
  });
  return { created: creates.length, replaced: replaces.length };
}

