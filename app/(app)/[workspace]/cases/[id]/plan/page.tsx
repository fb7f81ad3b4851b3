import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CaseNav } from '@/components/cases/case-nav';
import { PlanView } from '@/components/cases/plan-view';
import { PageHeader } from '@/components/ui/page-header';
import { PrintHeader } from '@/components/ui/print-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { fetchCase } from '@/lib/db/queries/cases';
import { idParams } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';

export const metadata: Metadata = { title: 'Fleet programme' };

export default async function PlanPage({ params }: { params: Promise<{ workspace: string; id: string }> }) {
  const p = await params;
  const { workspace } = p;
  const access = await getPageAccess(workspace);
  const c = await fetchCase(access.workspace.id, readPageParams(idParams, p).id);
  if (!c) notFound();
  return (
    <>
      <PrintHeader caseName={c.name} workspaceName={access.workspace.name} what="Fleet programme and ranking" />
      <PageHeader title={`${c.name}: fleet programme and ranking`} subtitle="When to repower each truck — now, at an overhaul, or some months late — so the fleet's expected NPV is highest within each fiscal year's budget and the shop's swaps a month." />
      <CaseNav slug={workspace} caseId={c.id} current="plan" />
      <PlanView slug={workspace} caseId={c.id} canEdit={hasRole(access, CAN.edit)} numberFormat={access.workspace.settings.numberFormat} />
      <SafetyCaution />
    </>
  );
}
