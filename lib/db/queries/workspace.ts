import 'server-only';
import { db } from '../index';

/** Counts of what the workspace holds, for the overview. */
export async function fetchWorkspaceCounts(workspaceId: number) {
  const count = async (table: string) => {
    const [row] = await db()(table).where({ workspaceId }).count<{ n: string | number }[]>({ n: '*' });
    return Number(row.n);
  };
  const [trucks, engines, offers, assumptionSets, cases] = await Promise.all(
    ['trucks', 'engine_types', 'repower_offers', 'assumption_sets', 'business_cases'].map(count),
  );
  return { trucks, engines, offers, assumptionSets, cases };
}

export type MemberRow = { userId: number; email: string; name: string; role: string; since: string; version: number };

export async function fetchMembers(workspaceId: number): Promise<MemberRow[]> {
  return db()('memberships as m')
    .join('users as u', 'u.id', 'm.userId')
    .where('m.workspaceId', workspaceId)
    .orderBy('u.email')
    .select('u.id as userId', 'u.email', 'u.name', 'm.role', 'm.createdAt as since', 'm.version');
}
