import type { CaseStatus } from '@/lib/approvals/workflow';

const STYLES: Record<CaseStatus, string> = {
  draft: 'border-rule text-muted',
  submitted: 'border-policy-rebuild/40 text-policy-rebuild',
  approved: 'border-gain/40 text-gain',
  rejected: 'border-loss/40 text-loss',
  returned: 'border-caution-rule text-caution',
};
const LABELS: Record<CaseStatus, string> = { draft: 'Draft', submitted: 'Waiting for approval', approved: 'Approved', rejected: 'Rejected', returned: 'Sent back' };

export function StatusBadge({ status }: { status: CaseStatus }) {
  return (
    <span className={`inline-block rounded border px-2 py-0.5 text-xs font-medium ${STYLES[status] ?? STYLES.draft}`} data-testid="case-status">
      {LABELS[status] ?? status}
    </span>
  );
}
