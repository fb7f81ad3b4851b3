import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { fetchAuditLog } from '@/lib/db/queries/audit';
import { parseOr422, route } from '@/lib/http';
import { auditFilterSchema, searchParamsObject } from '@/lib/validation/audit';

/**
 * GET ?user=&kind=&from=&to=&page=: the workspace's audit log, newest first, 50 a page.
 * Admins, approvers and analysts (CAN.audit); members' e-mail addresses only for admins.
 */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.audit);
  const filter = parseOr422(auditFilterSchema, searchParamsObject(new URL(req.url).searchParams));
  return NextResponse.json(await fetchAuditLog(access.workspace.id, filter, { showEmails: access.role === 'admin' }));
});
