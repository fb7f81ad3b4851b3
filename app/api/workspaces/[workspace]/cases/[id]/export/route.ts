import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { exportStoredCase } from '@/lib/export/case-export';
import { idParams, invalid, readParams, route } from '@/lib/http';

const TYPES = {
  xlsx: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
  csv: 'text/csv; charset=utf-8',
} as const;

/**
 * GET ?format=xlsx|csv: the case as a workbook of live formulas, or its
 * Summary table as CSV. Any member of the workspace may export (viewers too).
 * The workbook is written off the request thread and streamed from a file.
 */
export const GET = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const format = new URL(req.url).searchParams.get('format') ?? 'xlsx';
  if (format !== 'xlsx' && format !== 'csv') throw invalid([{ path: 'format', message: 'must be xlsx or csv' }]);
  const out = await exportStoredCase(access, readParams(idParams, p).id, format);
  return new Response(out.body, {
    headers: {
      'content-type': TYPES[format],
      'content-disposition': `attachment; filename="${out.fileName}"`,
      'cache-control': 'no-store',
      ...('bytes' in out ? { 'content-length': String(out.bytes) } : {}),
    },
  });
});
