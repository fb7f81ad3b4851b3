import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CaseNav } from '@/components/cases/case-nav';
import { RiskWorkbench } from '@/components/risk/risk-workbench';
import { PageHeader } from '@/components/ui/page-header';
import { PrintHeader } from '@/components/ui/print-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageAccess } from '@/lib/auth/page-access';
import { db } from '@/lib/db';
import { CAN_RUN_RISK } from '@/lib/risk/route-context';

export const metadata: Metadata = { title: 'Sensitivity and risk' };

/** Sensitivity and risk of one business case; `?truck=ID` opens it on one truck (links from truck pages). */
export default async function Page({ params, searchParams }: { params: Promise<{ workspace: string; id: string }>; searchParams: Promise<{ truck?: string }> }) {
  const { workspace, id } = await params;
  const { truck } = await searchParams;
  const access = await getPageAccess(workspace);
  const caseId = Number(id);
  if (!Number.isInteger(caseId) || caseId <= 0) notFound();
  const row = await db()('business_cases').where({ id: caseId, workspaceId: access.workspace.id }).first('id', 'name', 'status');
  if (!row) notFound();
  return (
    <>
      <PrintHeader caseName={row.name} workspaceName={access.workspace.name} what="Sensitivity and risk" />
      <PageHeader
        title={`Sensitivity and risk — ${row.name}`}
        subtitle="Which drivers matter, where the repower stops paying, and how likely it is to lose money."
      />
      <CaseNav slug={workspace} caseId={caseId} current="risk" />
      <RiskWorkbench slug={workspace} caseId={caseId} initialTruck={truck ?? null} negative={access.workspace.settings.negativeStyle} canRun={CAN_RUN_RISK.includes(access.role)} />
      <SafetyCaution />
    </>
  );
}
