import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { toCsv } from '@/lib/csv';
import { fetchAuditLog } from '@/lib/db/queries/audit';
import { parseOr422, route } from '@/lib/http';
import { auditFilterSchema, searchParamsObject } from '@/lib/validation/audit';

/** GET: the filtered audit log as CSV (every matching row), formula-looking cells neutralised; who may read it and see addresses as for the page. */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.audit);
  const filter = parseOr422(auditFilterSchema, searchParamsObject(new URL(req.url).searchParams));
  const { rows } = await fetchAuditLog(access.workspace.id, filter, { showEmails: access.role === 'admin' }, null);
  const csv = toCsv(
    ['id', 'at (UTC)', 'who', 'change', 'what', 'action', 'entity', 'entity id', 'before', 'after'],
    rows.map((r) => [r.id, r.at, r.who, r.kind, r.what, r.action, r.entity, r.entityId, r.before, r.after]),
  );
  const day = new Date().toISOString().slice(0, 10);
  return new Response(csv, {
    headers: {
      'content-type': 'text/csv; charset=utf-8',
      'content-disposition': `attachment; filename="haulcase-audit-${access.workspace.slug}-${day}.csv"`,
      'cache-control': 'no-store',
    },
  });
});
