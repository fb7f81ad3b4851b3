import 'server-only';
import type { Knex } from 'knex';
import { describeEntity, kindLabel, recordedName, withoutEmails } from '@/lib/audit-labels';
import { parseAuditJson } from '@/lib/audit-diff';
import type { AuditFilter } from '@/lib/validation/audit';
import { db } from '../index';

export type AuditRow = {
  id: number; at: string; userId: number | null;
  /** The person: their e-mail address for readers who may see addresses (admins), else their name. */
  who: string;
  action: string; entity: string; entityId: string | null;
  /** "Truck CT-114", "Business case “Base”", "Member Demo analyst". */
  what: string;
  /** "Business case: plan changed". */
  kind: string;
  before: string | null; after: string | null;
};

export type AuditView = {
  /** Members' e-mail addresses are shown to admins only; everyone else sees names, and addresses are taken out of before/after. */
  showEmails: boolean;
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

const personName = (p: { name?: string | null; email?: string | null }, showEmails: boolean) =>
  showEmails ? (p.email ?? '(system)') : p.name?.trim() || 'A member without a name';

/** Where the current name of each kind of entity is kept (a row still there is named as it is now). */
const NAME_SOURCES: Record<string, { table: string; columns: string[] }> = {
  truck: { table: 'trucks', columns: ['unitNumber'] },
  engine_type: { table: 'engine_types', columns: ['name', 'key'] },
  repower_offer: { table: 'repower_offers', columns: ['key'] },
  assumption_set: { table: 'assumption_sets', columns: ['name'] },
  business_case: { table: 'business_cases', columns: ['name'] },
  quote_document: { table: 'quote_documents', columns: ['fileName'] },
};

async function currentNames(k: Knex, workspaceId: number, rows: Array<{ entity: string; entityId: string | null }>, showEmails: boolean) {
  const names = new Map<string, string>();
  const wanted = new Map<string, Set<number>>();
  for (const r of rows) {
    if (r.entityId == null || !/^\d{1,12}$/.test(r.entityId)) continue;
    const set = wanted.get(r.entity) ?? new Set<number>();
    set.add(Number(r.entityId));
    wanted.set(r.entity, set);
  }
  for (const [entity, idSet] of wanted) {
    const ids = [...idSet];
    if (entity === 'membership') {
      for (const u of await k('users').whereIn('id', ids).select('id', 'name', 'email')) {
        names.set(`${entity}:${u.id}`, showEmails && !u.name ? u.email : u.name || 'a member without a name');
      }
      continue;
    }
    const source = NAME_SOURCES[entity];
    if (!source) continue;
    for (const row of await k(source.table).whereIn('id', ids).where({ workspaceId }).select('id', ...source.columns)) {
      const name = source.columns.map((c) => row[c]).find((v) => typeof v === 'string' && v.trim());
      if (name) names.set(`${entity}:${row.id}`, name);
    }
  }
  return names;
}

/** Newest first. `limit: null` returns every matching row (CSV download). */
export async function fetchAuditLog(workspaceId: number, f: Partial<AuditFilter>, view: AuditView, limit: number | null = AUDIT_PAGE_SIZE): Promise<{ rows: AuditRow[]; total: number }> {
  const k = db();
  const base = () => applyFilter(k('audit_log as a'), workspaceId, f);
  const [{ n }] = await base().count<{ n: number | string }[]>({ n: '*' });
  const q = base()
    .leftJoin('users as u', 'u.id', 'a.userId')
    .orderBy('a.id', 'desc')
    .select('a.id', 'a.at', 'a.userId', 'a.action', 'a.entity', 'a.entityId', 'a.before', 'a.after', 'u.email', 'u.name');
  if (limit !== null) q.limit(limit).offset(((f.page ?? 1) - 1) * limit);
  const raw = (await q) as Array<Omit<AuditRow, 'who' | 'what' | 'kind'> & { email: string | null; name: string | null }>;
  const names = await currentNames(k, workspaceId, raw, view.showEmails);
  const rows = raw.map(({ email, name, ...r }): AuditRow => {
    const recorded = recordedName(r.entity, parseAuditJson(r.before), parseAuditJson(r.after), view.showEmails);
    const entityName = names.get(`${r.entity}:${r.entityId}`) ?? recorded;
    return {
      ...r,
      who: r.userId == null ? '(system)' : personName({ email, name }, view.showEmails),
      // the settings and the workspace are this workspace's own: their id says nothing
      what: describeEntity(r.entity, r.entity === 'workspace_settings' || r.entity === 'workspace' ? null : r.entityId, entityName),
      kind: kindLabel(r.entity, r.action),
      before: view.showEmails ? r.before : withoutEmails(r.before),
      after: view.showEmails ? r.after : withoutEmails(r.after),
    };
  });
  return { rows, total: Number(n) };
}

/** People and entity/action kinds that occur in a workspace's log, for the filter lists. */
export async function fetchAuditFacets(workspaceId: number, view: AuditView) {
  const k = db();
  const people = await k('audit_log as a').join('users as u', 'u.id', 'a.userId').where('a.workspaceId', workspaceId).distinct('u.id', 'u.email', 'u.name').orderBy('u.email');
  const kinds = await k('audit_log').where({ workspaceId }).distinct('entity', 'action').orderBy(['entity', 'action']);
  return {
    people: (people as Array<{ id: number; email: string; name: string }>).map((p) => ({ id: p.id, label: view.showEmails ? p.email : personName(p, false) })),
    kinds: (kinds as Array<{ entity: string; action: string }>).map((x) => ({ ...x, label: kindLabel(x.entity, x.action) })),
  };
}
