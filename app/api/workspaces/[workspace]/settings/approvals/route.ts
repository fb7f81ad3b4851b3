import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { parseOr422, readJson, route } from '@/lib/http';
import { nowIso } from '@/lib/time';
import { approvalsSettingSchema } from '@/lib/validation/approval';

/**
 * PUT: how many distinct approvers a case needs (admins). Applies to decisions
 * from now on; a case already approved stays approved.
 */
export const PUT = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.administer);
  const { approvalsRequired } = parseOr422(approvalsSettingSchema, await readJson(req));
  await db().transaction(async (trx) => {
    // Re-read inside the transaction so other settings written meanwhile are kept.
    const row = await trx('workspaces').where({ id: access.workspace.id }).first('settings');
    const before = JSON.parse(row.settings || '{}');
    const after = { ...before, approvalsRequired };
    await trx('workspaces').where({ id: access.workspace.id }).update({ settings: JSON.stringify(after), updatedAt: nowIso() });
    await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'update', entity: 'workspace_settings', entityId: access.workspace.id, before: { approvalsRequired: before.approvalsRequired ?? 1 }, after: { approvalsRequired } });
  });
  return NextResponse.json({ approvalsRequired });
});
