import type { Metadata } from 'next';
import Link from 'next/link';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { fetchInbox, fetchRecentDecisions } from '@/lib/approvals/queries';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { StatusBadge } from '@/components/approvals/status-badge';

export const metadata: Metadata = { title: 'Approvals' };

const MINE = { waiting: 'Waiting for you', approved: 'You approved', own: 'You submitted' } as const;

export default async function ApprovalsPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const [inbox, recent] = await Promise.all([fetchInbox(access), fetchRecentDecisions(access.workspace.id)]);
  const decider = hasRole(access, CAN.decide);
  const required = access.workspace.settings.approvalsRequired;
  return (
    <>
      <PageHeader
        title="Approvals"
        subtitle={`Cases submitted for a capital decision. Each needs ${required} approver${required === 1 ? '' : 's'}, none of them its submitter.`}
      />
      {inbox.length === 0 ? (
        <EmptyState title="Nothing waiting for approval">
          Cases that analysts submit for approval appear here for approvers to review, comment, approve, reject or send back.
        </EmptyState>
      ) : (
        <div className="card overflow-x-auto">
          <table className="data-table" data-testid="approvals-inbox">
            <thead>
              <tr><th>Case</th><th>Submitted by</th><th>Submitted (UTC)</th><th className="n">Approvals</th>{decider ? <th>You</th> : null}</tr>
            </thead>
            <tbody>
              {inbox.map((r) => (
                <tr key={r.id}>
                  <td><Link className="underline" href={`/${workspace}/approvals/${r.id}`}>{r.name}</Link></td>
                  <td className="font-mono text-xs">{r.submittedBy}</td>
                  <td>{r.submittedAt.slice(0, 16).replace('T', ' ')}</td>
                  <td className="n">{r.approvals} / {required}</td>
                  {decider ? <td className={r.mine === 'waiting' ? 'font-medium text-policy-repower' : 'text-muted'}>{MINE[r.mine]}</td> : null}
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      <h2 className="mb-2 mt-6 text-sm font-semibold">Recently decided</h2>
      {recent.length === 0 ? (
        <p className="text-sm text-muted">No decisions yet.</p>
      ) : (
        <div className="card overflow-x-auto">
          <table className="data-table" data-testid="approvals-decided">
            <thead><tr><th>Case</th><th>Status</th><th>Decided (UTC)</th></tr></thead>
            <tbody>
              {recent.map((r) => (
                <tr key={r.id}>
                  <td><Link className="underline" href={`/${workspace}/approvals/${r.id}`}>{r.name}</Link></td>
                  <td><StatusBadge status={r.status} /></td>
                  <td>{(r.decidedAt ?? '').slice(0, 16).replace('T', ' ')}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
    </>
  );
}
