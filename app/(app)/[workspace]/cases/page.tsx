import type { Metadata } from 'next';
import Link from 'next/link';
import { CasesList } from '@/components/cases/cases-list';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';

export const metadata: Metadata = { title: 'Business cases' };

export default async function CasesPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  return (
    <>
      <PageHeader
        title="Business cases"
        subtitle={<>Keep, rebuild or repower, truck by truck, with NPV, payback and a capital plan. <Link className="text-accent underline" href={`/${workspace}/methodology`}>How the figures are computed</Link> · <Link className="text-accent underline" href={`/${workspace}/cases/compare`}>Compare two cases</Link></>}
      />
      <CasesList slug={workspace} canEdit={hasRole(access, CAN.edit)} />
      <SafetyCaution />
    </>
  );
}
