import type { Knex } from 'knex';

/**
 * A synthetic workspace of `n` trucks built from the demo's engines, offers and
 * Base assumptions, with hours spread deterministically (for timing runs only).
 */
export async function createSyntheticWorkspace(k: Knex, slug: string, n: number, memberEmail: string): Promise<void> {
  const now = new Date().toISOString();
  const demo = await k('workspaces').where({ slug: 'aldervane-north-pit' }).first();
  const [row] = await k('workspaces').insert({ slug, name: `Synthetic fleet (${n} trucks)`, currency: 'USD', settings: demo.settings, createdAt: now, updatedAt: now }).returning('id');
  const ws = typeof row === 'object' ? row.id : row;
  const user = await k('users').where({ email: memberEmail }).first('id');
  await k('memberships').insert({ workspaceId: ws, userId: user.id, role: 'analyst', createdAt: now });
  const stamp = { version: 1, createdAt: now, updatedAt: now };
  const engineIds = new Map<number, number>();
  for (const e of await k('engine_types').where({ workspaceId: demo.id })) {
    const { id, workspaceId: _w, ...rest } = e;
    const [r] = await k('engine_types').insert({ ...rest, ...stamp, workspaceId: ws }).returning('id');
    engineIds.set(id, typeof r === 'object' ? r.id : r);
  }
  const offerIds = new Map<number, number>();
  for (const o of await k('repower_offers').where({ workspaceId: demo.id })) {
    const { id, workspaceId: _w, engineTypeId, ...rest } = o;
    const [r] = await k('repower_offers').insert({ ...rest, ...stamp, workspaceId: ws, engineTypeId: engineIds.get(engineTypeId) }).returning('id');
    offerIds.set(id, typeof r === 'object' ? r.id : r);
  }
  const base = await k('assumption_sets').where({ workspaceId: demo.id, name: 'Base' }).first();
  await k('assumption_sets').insert({ workspaceId: ws, name: 'Base', assumptions: base.assumptions, valuation: base.valuation, lostMarginShare: base.lostMarginShare, ...stamp });
  const templates = await k('trucks').where({ workspaceId: demo.id }).orderBy('unitNumber');
  const rows = Array.from({ length: n }, (_, i) => {
    const t = templates[i % templates.length];
    const { id: _id, workspaceId: _w, unitNumber: _u, ...rest } = t;
    return {
      ...rest,
      ...stamp,
      workspaceId: ws,
      unitNumber: `S-${String(i + 1).padStart(3, '0')}`,
      engineTypeId: engineIds.get(t.engineTypeId),
      repowerOfferId: t.repowerOfferId ? offerIds.get(t.repowerOfferId) : null,
      engineHours: (t.engineHours + 997 * i) % 24_000,
      annualHours: 5_400 + ((i * 37) % 1_200),
    };
  });
  for (let i = 0; i < rows.length; i += 50) await k('trucks').insert(rows.slice(i, i + 50));
}
