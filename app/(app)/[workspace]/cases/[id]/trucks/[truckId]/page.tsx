import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CaseNav } from '@/components/cases/case-nav';
import { TruckView } from '@/components/cases/truck-view';
import { PageHeader } from '@/components/ui/page-header';
import { PrintHeader } from '@/components/ui/print-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageAccess } from '@/lib/auth/page-access';
import { caseTruckPageParams } from '@/lib/cases/params';
import { fetchCase } from '@/lib/db/queries/cases';
import { readPageParams } from '@/lib/http/page-params';

export const metadata: Metadata = { title: 'Truck in case' };

export default async function TruckPage({ params }: { params: Promise<{ workspace: string; id: string; truckId: string }> }) {
  const p = await params;
  const { workspace } = p;
  const access = await getPageAccess(workspace);
  // the unit segment as the link encoded it, decoded once here (a malformed one is not found)
  const { id, truckId: unit } = readPageParams(caseTruckPageParams, p);
  const c = await fetchCase(access.workspace.id, id);
  if (!c) notFound();
  return (
    <>
      <PrintHeader caseName={c.name} workspaceName={access.workspace.name} what={`Truck ${unit}`} />
      <PageHeader title={`Truck ${unit}`} subtitle={`In “${c.name}”: cash flows by year and category, engine events, and the case for repowering.`} />
      <CaseNav slug={workspace} caseId={c.id} current="truck" truckId={unit} />
      <TruckView slug={workspace} caseId={c.id} truckId={unit} />
      <SafetyCaution />
    </>
  );
}
