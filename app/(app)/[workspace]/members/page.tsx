import type { Metadata } from 'next';
import { AccessDenied } from '@/components/ui/access-denied';
import { PageHeader } from '@/components/ui/page-header';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN, ROLE_LABELS, type Role } from '@/lib/auth/roles';
import { fetchMembers } from '@/lib/db/queries/workspace';
import { fetchPendingInvitations } from '@/lib/accounts/invitations';
import { InviteForm } from './invite-form';
import { MemberRow } from './member-row';

export const metadata: Metadata = { title: 'Members' };

export default async function MembersPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  if (!hasRole(access, CAN.administer)) return <AccessDenied need={CAN.administer} have={access.role} />;
  const [members, invitations] = await Promise.all([fetchMembers(access.workspace.id), fetchPendingInvitations(access.workspace.id)]);
  return (
    <>
      <PageHeader title="Members" subtitle="People in this workspace and their roles." />
      <div className="card overflow-x-auto">
        <table className="data-table" data-testid="members-table">
          <thead>
            <tr>
              <th>Email</th>
              <th>Name</th>
              <th>Role</th>
              <th>Member since</th>
              <th><span className="sr-only">Actions</span></th>
            </tr>
          </thead>
          <tbody>
            {members.map((m) => (
              <MemberRow key={`${m.userId}-${m.version}`} workspace={workspace} member={{ ...m, role: m.role as Role }} isSelf={m.userId === access.userId} />
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-2 text-xs text-muted">
        A role change or removal takes effect on the person&apos;s next click: their role is checked on every request, so
        a removed member&apos;s open session can no longer read or change anything here (their account and other
        workspaces stay). A workspace always keeps at least one admin.
      </p>
      <h2 className="mb-2 mt-6 text-sm font-semibold">Invite someone</h2>
      <InviteForm workspace={workspace} />
      {invitations.length ? (
        <div className="card mt-3 overflow-x-auto">
          <table className="data-table" data-testid="invitations-table">
            <thead><tr><th>Invited email</th><th>Role</th><th>Link expires (UTC)</th></tr></thead>
            <tbody>
              {invitations.map((i) => (
                <tr key={i.id}><td className="font-mono text-xs">{i.email}</td><td>{ROLE_LABELS[i.role as Role]}</td><td>{String(i.expiresAt).slice(0, 16).replace('T', ' ')}</td></tr>
              ))}
            </tbody>
          </table>
        </div>
      ) : null}
      <p className="mt-3 text-xs text-muted">
        Roles: admins manage members and settings; analysts keep the data and build cases; approvers decide on submitted
        cases; viewers read the data and cases. Admins, analysts and approvers can read the audit log; only admins see
        members&apos; e-mail addresses there.
      </p>
    </>
  );
}
