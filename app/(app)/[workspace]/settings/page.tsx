import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';

export const metadata: Metadata = { title: 'Settings' };

export default function Page() {
  return (
    <>
      <PageHeader title="Settings" subtitle="Currency, display units and approval rules for this workspace." />
      <EmptyState title="Workspace settings">Display units (metric or US customary), how negative amounts are shown, and how many approvers a case needs.</EmptyState>
    </>
  );
}
