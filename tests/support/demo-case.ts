import type { Knex } from 'knex';

/**
 * A business case over every truck of a workspace (each with its own offer)
 * and its first assumption set, written straight to the table so risk tests
 * do not depend on the case screens. Returns the case id.
 */
export async function insertDemoCase(k: Knex, slug: string, name = 'North Pit repower programme'): Promise<number> {
  const ws = await k('workspaces').where({ slug }).first('id');
  const set = await k('assumption_sets').where({ workspaceId: ws.id }).orderBy('id').first('id');
  const user = await k('memberships').where({ workspaceId: ws.id, role: 'analyst' }).first('userId');
  const trucks = await k('trucks').where({ workspaceId: ws.id }).orderBy('unitNumber').select('id');
  const selection = JSON.stringify(trucks.map((t) => ({ truckId: t.id, repowerOfferId: null })));
  const now = new Date().toISOString();
  const [row] = await k('business_cases')
    .insert({
      workspaceId: ws.id, name, assumptionSetId: set.id, selection, plan: '{}', status: 'draft', version: 1,
      createdBy: user?.userId ?? null, updatedBy: user?.userId ?? null, createdAt: now, updatedAt: now,
    })
    .returning('id');
  return typeof row === 'object' ? row.id : row;
}
