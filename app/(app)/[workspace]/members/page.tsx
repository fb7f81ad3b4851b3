import type { Metadata } from 'next';
import { AccessDenied } from '@/components/ui/access-denied';
import { PageHeader } from '@/components/ui/page-header';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN, ROLE_LABELS, type Role } from '@/lib/auth/roles';
import { fetchMembers } from '@/lib/db/queries/workspace';

export const metadata: Metadata = { title: 'Members' };

export default async function MembersPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  if (!hasRole(access, CAN.administer)) return <AccessDenied need={CAN.administer} have={access.role} />;
  const members = await fetchMembers(access.workspace.id);
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
            </tr>
          </thead>
          <tbody>
            {members.map((m) => (
              <tr key={m.userId}>
                <td className="font-mono text-xs">{m.email}</td>
                <td>{m.name}</td>
                <td>{ROLE_LABELS[m.role as Role]}</td>
                <td>{m.since.slice(0, 10)}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <p className="mt-3 text-xs text-muted">
        Roles: admins manage members and settings; analysts keep the data and build cases; approvers decide on submitted
        cases; viewers read.
      </p>
    </>
  );
}
