import 'server-only';
import type { Knex } from 'knex';
import type { AuditFilter } from '@/lib/validation/audit';
import { db } from '../index';

export type AuditRow = {
  id: number; at: string; userId: number | null; who: string; action: string; entity: string; entityId: string | null; before: string | null; after: string | null;
};

export const AUDIT_PAGE_SIZE = 50;

/** A filter's "kind" is `entity` or `entity:action`, as listed by fetchAuditKinds. */
function applyFilter(q: Knex.QueryBuilder, workspaceId: number, f: Partial<AuditFilter>) {
  q.where('a.workspaceId', workspaceId);
  if (f.user) q.where('a.userId', f.user);
  if (f.kind) {
    const [entity, action] = f.kind.split(':');
    q.where('a.entity', entity);
    if (action) q.where('a.action', action);
  }
  // Stored times are ISO-8601 UTC text, so text comparison orders them correctly.
  if (f.from) q.where('a.at', '>=', `${f.from}T00:00:00.000Z`);
  if (f.to) q.where('a.at', '<=', `${f.to}T23:59:59.999Z`);
  return q;
}

/** Newest first. `limit: null` returns every matching row (CSV download). */
export async function fetchAuditLog(workspaceId: number, f: Partial<AuditFilter>, limit: number | null = AUDIT_PAGE_SIZE): Promise<{ rows: AuditRow[]; total: number }> {
  const k = db();
  const base = () => applyFilter(k('audit_log as a'), workspaceId, f);
  const [{ n }] = await base().count<{ n: number | string }[]>({ n: '*' });
  const q = base()
    .leftJoin('users as u', 'u.id', 'a.userId')
    .orderBy('a.id', 'desc')
    .select('a.id', 'a.at', 'a.userId', 'a.action', 'a.entity', 'a.entityId', 'a.before', 'a.after', k.raw("coalesce(u.email, '(system)') as who"));
  if (limit !== null) q.limit(limit).offset(((f.page ?? 1) - 1) * limit);
  return { rows: await q, total: Number(n) };
}

/** People and entity/action kinds that occur in a workspace's log, for the filter lists. */
export async function fetchAuditFacets(workspaceId: number) {
  const k = db();
  const people = await k('audit_log as a').join('users as u', 'u.id', 'a.userId').where('a.workspaceId', workspaceId).distinct('u.id', 'u.email').orderBy('u.email');
  const kinds = await k('audit_log').where({ workspaceId }).distinct('entity', 'action').orderBy(['entity', 'action']);
  return { people: people as Array<{ id: number; email: string }>, kinds: kinds as Array<{ entity: string; action: string }> };
}
