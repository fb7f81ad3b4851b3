import type { Knex } from 'knex';
import type { Access } from '@/lib/auth/access';
import { writeAudit } from '@/lib/audit';
import { nowIso } from '@/lib/time';
import type { FleetImportPlan, ImportLookups } from './validate-fleet';

export async function loadImportLookups(k: Knex, workspaceId: number): Promise<ImportLookups> {
  const [engines, offers, trucks] = await Promise.all([
    k('engine_types').where({ workspaceId }).select('id', 'key'),
    k('repower_offers').where({ workspaceId }).select('id', 'key'),
    k('trucks').where({ workspaceId }).select('id', 'unitNumber'),
  ]);
  return {
    engines: new Map(engines.map((e) => [e.key, e.id])),
    offers: new Map(offers.map((o) => [o.key, o.id])),
    trucks: new Map(trucks.map((t) => [t.unitNumber, t.id])),
  };
}

/**
 * Writes a plan that has no problems, all in the caller's transaction: new
 * trucks inserted, existing ones (by unit number) updated with their version
 * bumped, and one audit row naming every unit with the values it replaced.
 */
export async function commitFleetImport(trx: Knex.Transaction, access: Access, plan: FleetImportPlan, fileName: string) {
  if (plan.problems.length) throw new Error('commitFleetImport called with problems');
  const wsId = access.workspace.id;
  const now = nowIso();
  const stamp = { updatedBy: access.userId, updatedAt: now };
  const creates = plan.rows.filter((r) => r.action === 'create');
  const updates = plan.rows.filter((r) => r.action === 'update');
  await trx.batchInsert(
    'trucks',
    creates.map((r) => ({ workspaceId: wsId, ...r.input, version: 1, createdBy: access.userId, createdAt: now, ...stamp })),
    200,
  );
  const before: Record<string, unknown>[] = [];
  for (const r of updates) {
    const { workspaceId: _w, ...old } = await trx('trucks').where({ id: r.truckId, workspaceId: wsId }).first();
    before.push(old);
    await trx('trucks').where({ id: r.truckId, workspaceId: wsId }).update({ ...r.input, version: trx.raw('version + 1'), ...stamp });
  }
  await writeAudit(trx, {
    workspaceId: wsId,
    userId: access.userId,
    action: 'import',
    entity: 'truck',
    entityId: null,
    before: updates.length ? before : undefined,
    after: { fileName, created: creates.map((r) => r.unitNumber), updated: updates.map((r) => r.unitNumber), rows: plan.rows.map((r) => r.input) },
  });
  return { created: creates.length, updated: updates.length };
}
