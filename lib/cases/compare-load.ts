import 'server-only';
/**
 * Loading two stored cases for the side-by-side comparison: each is read as
 * its own pages read it (lib/cases/evaluate.ts: the frozen record of an
 * approved case, the snapshot of a submitted one, live data for a draft), then
 * compared by the pure lib/cases/compare.ts.
 */
import type { Access } from '@/lib/auth/access';
import { db } from '@/lib/db';
import { HttpError, idParam, invalid, type Problem } from '@/lib/http';
import { compareCases, type CaseComparison, type CompareSide } from './compare';
import { evaluateStoredCase, loadValidCase } from './evaluate';

/** The query's case ids: each must be a positive whole number (422 naming `a` or `b`), and the two must differ. */
export function parseCompareIds(params: URLSearchParams): { a: number; b: number } {
  const problems: Problem[] = [];
  const read = (key: 'a' | 'b'): number => {
    const raw = params.get(key);
    if (raw === null || raw === '') {
      problems.push({ path: key, message: `choose case ${key.toUpperCase()}` });
      return 0;
    }
    // the digit rule of every id in a URL (lib/http.ts idParam)
    const id = idParam.safeParse(raw);
    if (!id.success) problems.push({ path: key, message: 'must be a case id (a positive whole number)' });
    return id.success ? id.data : 0;
  };
  const a = read('a');
  const b = read('b');
  if (!problems.length && a === b) problems.push({ path: 'b', message: 'choose a different case from case A' });
  if (problems.length) throw invalid(problems, 'Choose two cases to compare.');
  return { a, b };
}

async function loadSide(access: Access, id: number, key: 'a' | 'b'): Promise<CompareSide> {
  try {
    const { row, file } = await loadValidCase(access, id);
    const dto = await evaluateStoredCase(access, id);
    return { id, name: row.name, status: row.status, file, plan: row.plan, result: dto.result };
  } catch (err) {
    // say which of the two cases cannot be read
    if (err instanceof HttpError && err.status === 404) throw new HttpError(404, `Case ${key.toUpperCase()}: ${err.message}`);
    if (err instanceof HttpError && err.status === 422) {
      throw invalid((err.problems ?? []).map((p) => ({ path: `${key}.${p.path}`, message: p.message })), `Case ${key.toUpperCase()} cannot be evaluated.`);
    }
    throw err;
  }
}

export async function loadComparison(access: Access, a: number, b: number): Promise<CaseComparison> {
  const sa = await loadSide(access, a, 'a');
  const sb = await loadSide(access, b, 'b');
  return compareCases(sa, sb);
}

/** The case a revision was copied from (`revisionOf`), when it is still in the workspace. */
export async function fetchPreviousRevision(workspaceId: number, id: number): Promise<{ id: number; name: string } | null> {
  const row = await db()('business_cases as c')
    .join('business_cases as p', 'p.id', 'c.revisionOf')
    .where({ 'c.id': id, 'c.workspaceId': workspaceId, 'p.workspaceId': workspaceId })
    .first('p.id as id', 'p.name as name');
  return row ? { id: row.id, name: row.name } : null;
}
