import 'server-only';
import type { Access } from '@/lib/auth/access';
import { CAN, type Role } from '@/lib/auth/roles';
import { fetchInbox } from '@/lib/approvals/queries';
import { fetchPendingInvitations } from '@/lib/accounts/invitations';
import { fetchOutboxQueue } from '@/lib/mail/outbox';
import { db } from '../index';

export type OverviewCase = { id: number; name: string; status: string; at: string | null; who?: string };

/**
 * What the overview lists for the caller's role:
 * - approvers and admins: submitted cases waiting for their decision (not
 *   their own submission, not yet approved by them in this round);
 * - analysts: their own drafts and their cases sent back for changes;
 *   admins: every draft and returned case of the workspace;
 * - viewers: the approved cases, newest decision first;
 * - admins also: members, invitations pending, mail waiting or failed.
 */
export async function fetchOverview(access: Access) {
  const role: Role = access.role;
  const wsId = access.workspace.id;
  const k = db();
  const decides = (CAN.decide as readonly string[]).includes(role);
  const edits = (CAN.edit as readonly string[]).includes(role);

  const waiting: OverviewCase[] = decides
    ? (await fetchInbox(access)).filter((r) => r.mine === 'waiting').map((r) => ({ id: r.id, name: r.name, status: 'submitted', at: r.submittedAt, who: r.submittedBy }))
    : [];

  let drafts: OverviewCase[] = [];
  let returned: OverviewCase[] = [];
  if (edits) {
    const q = k('business_cases').where({ workspaceId: wsId }).whereIn('status', ['draft', 'returned']).orderBy('updatedAt', 'desc').select('id', 'name', 'status', 'updatedAt', 'decidedAt');
    if (role !== 'admin') q.where({ createdBy: access.userId });
    const rows = await q;
    drafts = rows.filter((r) => r.status === 'draft').map((r) => ({ id: r.id, name: r.name, status: r.status, at: r.updatedAt }));
    returned = rows.filter((r) => r.status === 'returned').map((r) => ({ id: r.id, name: r.name, status: r.status, at: r.decidedAt ?? r.updatedAt }));
  }

  const approved: OverviewCase[] = role === 'viewer'
    ? (await k('business_cases').where({ workspaceId: wsId, status: 'approved' }).orderBy('decidedAt', 'desc').limit(20).select('id', 'name', 'status', 'decidedAt'))
      .map((r) => ({ id: r.id, name: r.name, status: r.status, at: r.decidedAt }))
    : [];

  let admin: { members: number; admins: number; invitations: number; mailWaiting: number; mailFailed: number } | null = null;
  if (role === 'admin') {
    const [memberRows, invitations, queue] = await Promise.all([
      k('memberships').where({ workspaceId: wsId }).select('role'),
      fetchPendingInvitations(wsId),
      fetchOutboxQueue(access.workspace.slug, 500),
    ]);
    admin = {
      members: memberRows.length,
      admins: memberRows.filter((m) => m.role === 'admin').length,
      invitations: invitations.length,
      mailWaiting: queue.filter((m) => m.status !== 'failed').length,
      mailFailed: queue.filter((m) => m.status === 'failed').length,
    };
  }
  return { role, waiting, drafts, returned, approved, admin };
}
