import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CaseNav } from '@/components/cases/case-nav';
import { CaseResults } from '@/components/cases/case-results';
import { ExportButtons } from '@/components/export/export-buttons';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageAccess } from '@/lib/auth/page-access';
import { fetchCase } from '@/lib/db/queries/cases';

export const metadata: Metadata = { title: 'Case results' };

export default async function CasePage({ params }: { params: Promise<{ workspace: string; id: string }> }) {
  const { workspace, id } = await params;
  const access = await getPageAccess(workspace);
  const c = /^\d{1,9}$/.test(id) ? await fetchCase(access.workspace.id, Number(id)) : null;
  if (!c) notFound();
  return (
    <>
      <PageHeader title={c.name} subtitle="NPV of keep, rebuild and repower for every truck; the best policy; the gain of repowering." action={<ExportButtons slug={workspace} caseId={c.id} />} />
      <CaseNav slug={workspace} caseId={c.id} current="results" />
      <CaseResults slug={workspace} caseId={c.id} />
      <SafetyCaution />
    </>
  );
}
