import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';

export const metadata: Metadata = { title: 'Repower offers' };

export default function Page() {
  return (
    <>
      <PageHeader title="Repower offers" subtitle="Supplier quotes for repower modules, with their quote documents." />
      <EmptyState title="No repower offers yet">Each supplier quote: module price, install cost, core credit for the old engine, days down, timing and productivity gain, with the quote document beside it.</EmptyState>
      <SafetyCaution />
    </>
  );
}
