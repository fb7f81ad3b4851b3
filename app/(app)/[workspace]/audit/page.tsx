import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';

export const metadata: Metadata = { title: 'Audit log' };

export default function Page() {
  return (
    <>
      <PageHeader title="Audit log" subtitle="Every change to this workspace's data: who, when, what, before and after." />
      <EmptyState title="No changes recorded yet">Every change to trucks, engines, offers, assumptions, cases and members is listed here.</EmptyState>
    </>
  );
}
