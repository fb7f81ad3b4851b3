/**
 * Field-by-field difference of an audit row's before/after JSON, for the audit
 * log: one line per top-level field that was added, removed or changed, and
 * nothing else.
 *
 * - Book-keeping columns (id, workspaceId, version, createdAt/By, updatedAt/By)
 *   are never listed: they change on every write and say nothing to a reader.
 * - An update stores the whole row before and only the fields written after
 *   (`lib/api/crud.ts`), so when both sides are objects a field that is only in
 *   `before` was not part of the change and is not listed; a field that is in
 *   both is listed only when its value differs.
 * - A create lists what was written (added), a delete what was removed.
 */
export type DiffLine = { field: string; kind: 'added' | 'removed' | 'changed'; before?: string; after?: string };

export const BOOKKEEPING_FIELDS: ReadonlySet<string> = new Set(['id', 'workspaceId', 'version', 'createdAt', 'createdBy', 'updatedAt', 'updatedBy']);

const show = (v: unknown): string => (typeof v === 'string' ? v : JSON.stringify(v));

export function parseAuditJson(text: string | null): unknown {
  if (text == null) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

const isObj = (v: unknown): v is Record<string, unknown> => Boolean(v) && typeof v === 'object' && !Array.isArray(v);

export function diffAudit(beforeText: string | null, afterText: string | null): DiffLine[] {
  const before = parseAuditJson(beforeText);
  const after = parseAuditJson(afterText);
  if (!isObj(before) && !isObj(after)) {
    if (before == null && after == null) return [];
    if (before != null && after != null && show(before) === show(after)) return [];
    return [{ field: '(value)', kind: before == null ? 'added' : after == null ? 'removed' : 'changed', before: before == null ? undefined : show(before), after: after == null ? undefined : show(after) }];
  }
  const both = isObj(before) && isObj(after);
  const b = isObj(before) ? before : {};
  const a = isObj(after) ? after : {};
  const lines: DiffLine[] = [];
  for (const field of [...new Set([...Object.keys(b), ...Object.keys(a)])]) {
    if (BOOKKEEPING_FIELDS.has(field)) continue;
    const inB = field in b;
    const inA = field in a;
    if (inB && inA) {
      if (show(b[field]) !== show(a[field])) lines.push({ field, kind: 'changed', before: show(b[field]), after: show(a[field]) });
    } else if (inA) lines.push({ field, kind: 'added', after: show(a[field]) });
    else if (!both) lines.push({ field, kind: 'removed', before: show(b[field]) });
  }
  return lines;
}
