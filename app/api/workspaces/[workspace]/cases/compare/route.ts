import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { comparisonCsv } from '@/lib/cases/compare';
import { loadComparison, parseCompareIds } from '@/lib/cases/compare-load';
import { exportFileName } from '@/lib/export/case-export';
import { invalid, route } from '@/lib/http';

/**
 * GET ?a=ID&b=ID[&format=csv]: what changed from case A to case B, inputs
 * field by field and results fleet and per truck, largest first (any member).
 * 422 names `a`, `b` or `format`, or (prefixed `a.` / `b.`) what stops a case
 * from being evaluated; 404 when a case is not in this workspace.
 */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  const query = new URL(req.url).searchParams;
  const format = query.get('format') ?? 'json';
  if (format !== 'json' && format !== 'csv') throw invalid([{ path: 'format', message: 'must be json or csv' }]);
  const { a, b } = parseCompareIds(query);
  const comparison = await loadComparison(access, a, b);
  if (format === 'json') return NextResponse.json(comparison);
  const fileName = exportFileName(`compare ${comparison.a.name} ${comparison.b.name}`, 'csv');
  return new Response(comparisonCsv(comparison), {
    headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': `attachment; filename="${fileName}"`, 'cache-control': 'no-store' },
  });
});
