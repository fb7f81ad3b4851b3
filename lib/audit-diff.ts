/**
 * Field-by-field difference of an audit row's before/after JSON, for the diff
 * view: one line per top-level field that was added, removed or changed.
 */
export type DiffLine = { field: string; kind: 'added' | 'removed' | 'changed'; before?: string; after?: string };

const show = (v: unknown): string => (typeof v === 'string' ? v : JSON.stringify(v));

function parse(text: string | null): unknown {
  if (text == null) return undefined;
  try {
    return JSON.parse(text);
  } catch {
    return text;
  }
}

export function diffAudit(beforeText: string | null, afterText: string | null): DiffLine[] {
  const before = parse(beforeText);
  const after = parse(afterText);
  const isObj = (v: unknown): v is Record<string, unknown> => Boolean(v) && typeof v === 'object' && !Array.isArray(v);
  if (!isObj(before) && !isObj(after)) {
    if (before === undefined && after === undefined) return [];
    return [{ field: '(value)', kind: before === undefined ? 'added' : after === undefined ? 'removed' : 'changed', before: before === undefined ? undefined : show(before), after: after === undefined ? undefined : show(after) }];
  }
  const b = isObj(before) ? before : {};
  const a = isObj(after) ? after : {};
  const lines: DiffLine[] = [];
  for (const field of [...new Set([...Object.keys(b), ...Object.keys(a)])]) {
    const inB = field in b;
    const inA = field in a;
    if (inB && inA) {
      if (show(b[field]) !== show(a[field])) lines.push({ field, kind: 'changed', before: show(b[field]), after: show(a[field]) });
    } else if (inA) lines.push({ field, kind: 'added', after: show(a[field]) });
    else lines.push({ field, kind: 'removed', before: show(b[field]) });
  }
  return lines;
}
