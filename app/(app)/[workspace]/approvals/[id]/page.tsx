import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { CaseApprovalPanel } from '@/components/approvals/case-approval-panel';
import { DecisionSummaryPanel } from '@/components/cases/decision-summary';
import { DecisionPackLink } from '@/components/cases/decision-pack-link';
import { PageHeader } from '@/components/ui/page-header';
import { PrintHeader } from '@/components/ui/print-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { readFrozenResult } from '@/lib/approvals/freeze';
import { fetchCaseSummary } from '@/lib/approvals/summary';
import { getPageAccess } from '@/lib/auth/page-access';
import { formatMoney } from '@/lib/format';
import { idParams } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';

export const metadata: Metadata = { title: 'Review a case' };

const POLICIES = ['keep', 'rebuild', 'repower', 'best'] as const;

export default async function ReviewCasePage({ params }: { params: Promise<{ workspace: string; id: string }> }) {
  const p = await params;
  const { workspace } = p;
  const access = await getPageAccess(workspace);
  const { id: caseId } = readPageParams(idParams, p);
  const summary = await fetchCaseSummary(access.workspace.id, caseId);
  if (!summary) notFound();
  const frozen = readFrozenResult(summary.row);
  const neg = access.workspace.settings.negativeStyle;
  return (
    <>
      <PrintHeader caseName={summary.row.name} workspaceName={access.workspace.name} what="Approval" />
      <PageHeader
        title={summary.row.name}
        subtitle={
          <>
            Business case{' '}
            {summary.row.revisionOf ? (
              <>
                · revision of <Link className="underline" href={`/${workspace}/approvals/${summary.row.revisionOf}`}>case {summary.row.revisionOf}</Link> ·{' '}
                <Link className="underline" data-testid="compare-previous" href={`/${workspace}/cases/compare?a=${summary.row.revisionOf}&b=${caseId}`}>what changed since it</Link>
              </>
            ) : null}
          </>
        }
        action={<><DecisionPackLink slug={workspace} caseId={caseId} primary /><Link className="btn" href={`/${workspace}/cases/${caseId}`}>Open the case</Link></>}
      />
      <div className="grid gap-4 lg:grid-cols-[1fr_26rem] print:block">
        <div className="space-y-4">
          <dl className="card grid grid-cols-[12rem_1fr] gap-x-4 gap-y-1 p-4 text-sm">
            <dt className="text-muted">Assumption set</dt><dd>{summary.assumptionSet ?? '—'}</dd>
            <dt className="text-muted">Trucks</dt><dd>{summary.truckCount}</dd>
            <dt className="text-muted">Currency</dt><dd>{access.workspace.currency}</dd>
          </dl>
          <DecisionSummaryPanel slug={workspace} caseId={caseId} negativeStyle={neg} />
          {frozen ? (
            <div className="card overflow-x-auto">
              <table className="data-table" data-testid="frozen-fleet">
                <caption className="px-2 py-2 text-left text-xs text-muted">Fleet NPV of each policy for every truck, as approved (from the frozen result, {access.workspace.currency} k)</caption>
                <thead><tr>{POLICIES.map((p) => <th key={p} className="n">{p === 'best' ? 'Best per truck' : p[0].toUpperCase() + p.slice(1)}</th>)}</tr></thead>
                <tbody><tr>{POLICIES.map((p) => <td key={p} className="n">{formatMoney(frozen.fleet.npv[p], { scale: 'k', negative: neg })}</td>)}</tr></tbody>
              </table>
            </div>
          ) : null}
        </div>
        <CaseApprovalPanel workspace={workspace} caseId={caseId} />
      </div>
      <SafetyCaution />
    </>
  );
}
