import { NextResponse } from 'next/server';
import { parseSettings, requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { writeAudit } from '@/lib/audit';
import { db } from '@/lib/db';
import { parseOr422, readJson, route } from '@/lib/http';
import { nowIso } from '@/lib/time';
import { displaySettingsSchema } from '@/lib/validation/fleet';

/**
 * PATCH { units?, negativeStyle?, fiscalYearStartMonth?, numberFormat? }: display settings of the workspace (admins).
 * Only the fields sent change; other settings are merged as stored.
 */
export const PATCH = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.administer);
  const change = parseOr422(displaySettingsSchema, await readJson(req));
  const settings = await db().transaction(async (trx) => {
    const row = await trx('workspaces').where({ id: access.workspace.id }).first('settings');
    const before = parseSettings(row?.settings);
    const after = { ...JSON.parse(row?.settings || '{}'), ...change };
    await trx('workspaces').where({ id: access.workspace.id }).update({ settings: JSON.stringify(after), updatedAt: nowIso() });
    await writeAudit(trx, { workspaceId: access.workspace.id, userId: access.userId, action: 'update', entity: 'workspace_settings', entityId: access.workspace.id, before, after });
    return parseSettings(JSON.stringify(after));
  });
  return NextResponse.json({ settings });
});
