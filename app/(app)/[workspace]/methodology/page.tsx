import type { Metadata } from 'next';
import { MethodologyContent } from '@/components/cases/methodology-content';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Methodology' };

export default async function MethodologyPage({ params }: { params: Promise<{ workspace: string }> }) {
  await getPageAccess((await params).workspace);
  return (
    <>
      <PageHeader title="Methodology" subtitle="How every figure in a business case is computed, in plain words and formulas." />
      <MethodologyContent />
    </>
  );
}
