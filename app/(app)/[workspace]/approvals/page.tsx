import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';

export const metadata: Metadata = { title: 'Approvals' };

export default function Page() {
  return (
    <>
      <PageHeader title="Approvals" subtitle="Cases submitted for a capital decision." />
      <EmptyState title="Nothing waiting for approval">Cases that analysts submit for approval appear here for approvers to review, comment, approve, reject or send back.</EmptyState>
    </>
  );
}
