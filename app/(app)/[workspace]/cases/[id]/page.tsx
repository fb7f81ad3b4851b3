import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { CaseApprovalPanel } from '@/components/approvals/case-approval-panel';
import { CaseNav } from '@/components/cases/case-nav';
import { CaseEngineLives } from '@/components/cases/case-engine-lives';
import { CaseSettings } from '@/components/cases/case-settings';
import { DecisionSummaryPanel } from '@/components/cases/decision-summary';
import { CaseResults } from '@/components/cases/case-results';
import { OwnTruckFigures } from '@/components/cases/own-truck-figures';
import { DecisionPackLink } from '@/components/cases/decision-pack-link';
import { ExportButtons } from '@/components/export/export-buttons';
import { PrintHeader } from '@/components/ui/print-header';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { fetchPreviousRevision } from '@/lib/cases/compare-load';
import { fetchCase } from '@/lib/db/queries/cases';
import { listOwnTruckFigures } from '@/lib/db/queries/reforecast';
import { db } from '@/lib/db';
import { idParams } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';

export const metadata: Metadata = { title: 'Case results' };

type Props = { params: Promise<{ workspace: string; id: string }>; searchParams: Promise<{ edit?: string }> };

export default async function CasePage({ params, searchParams }: Props) {
  const p = await params;
  const { workspace } = p;
  const { edit } = await searchParams;
  const access = await getPageAccess(workspace);
  const c = await fetchCase(access.workspace.id, readPageParams(idParams, p).id);
  if (!c) notFound();
  const previous = await fetchPreviousRevision(access.workspace.id, c.id);
  // an approved or submitted case shows its frozen or submitted figures, which already hold these
  const ownFigures = c.status === 'approved' || c.status === 'submitted' ? [] : await listOwnTruckFigures(db(), access.workspace.id, c.truckFigures);
  return (
    <>
      <PrintHeader caseName={c.name} workspaceName={access.workspace.name} what="Results" />
      <PageHeader title={c.name} subtitle="The proposal the saved plan makes, then NPV of keep, rebuild and repower for every truck, the best policy and the gain of repowering." action={<><DecisionPackLink slug={workspace} caseId={c.id} /><ExportButtons slug={workspace} caseId={c.id} /></>} />
      <CaseNav slug={workspace} caseId={c.id} current="results" />
      <div className="mb-4"><DecisionSummaryPanel slug={workspace} caseId={c.id} negativeStyle={access.workspace.settings.negativeStyle} /></div>
      {c.status === 'approved' ? (
        <p className="mb-3 text-sm"><Link className="text-accent underline" data-testid="actuals-link" href={`/${workspace}/cases/${c.id}/actuals`}>Plan against actual: what this approved case promised against the readings since its approval</Link></p>
      ) : null}
      {previous ? <p className="mb-3 text-sm"><Link className="text-accent underline" href={`/${workspace}/cases/compare?a=${previous.id}&b=${c.id}`}>What changed since the previous revision ({previous.name}, #{previous.id})</Link></p> : null}
      {/* the form shows only to editors; the PATCH handler checks the role and status again */}
      <CaseSettings slug={workspace} caseId={c.id} canEdit={(CAN.edit as readonly string[]).includes(access.role)} startOpen={edit === '1'} />
      <OwnTruckFigures rows={ownFigures} />
      <CaseEngineLives slug={workspace} caseId={c.id} canEdit={(CAN.edit as readonly string[]).includes(access.role)} />
      <CaseResults slug={workspace} caseId={c.id} />
      <div className="mt-4 max-w-2xl"><CaseApprovalPanel workspace={workspace} caseId={c.id} /></div>
      <SafetyCaution />
    </>
  );
}
