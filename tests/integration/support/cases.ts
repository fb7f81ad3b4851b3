import type { Knex } from 'knex';

/** A draft business case over the whole demo fleet with the named assumption set (the cases branch owns creation). */
export async function insertDraftCase(k: Knex, slug: string, name: string, setName = 'Base', userId: number | null = null): Promise<number> {
  const ws = await k('workspaces').where({ slug }).first('id');
  const set = await k('assumption_sets').where({ workspaceId: ws.id }).andWhere('name', 'like', `${setName}%`).first('id');
  const now = new Date().toISOString();
  const [row] = await k('business_cases')
    .insert({ workspaceId: ws.id, name, assumptionSetId: set?.id ?? null, selection: '[]', plan: '{}', status: 'draft', createdBy: userId, updatedBy: userId, createdAt: now, updatedAt: now })
    .returning('id');
  return typeof row === 'object' ? row.id : row;
}

export { userIds } from '../../support/test-db';
