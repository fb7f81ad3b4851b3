import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';

export const metadata: Metadata = { title: 'Assumptions' };

export default function Page() {
  return (
    <>
      <PageHeader title="Assumptions" subtitle="Named sets of economic assumptions: base, high fuel, low fuel …" />
      <EmptyState title="No assumption sets yet">Discount rate, inflation, fuel price and escalation, lube, labour, carbon price, margin per tonne, tax rate, depreciation and the accounting of rebuilds, in named sets you can copy and compare.</EmptyState>
    </>
  );
}
