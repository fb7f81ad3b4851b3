import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';

export const metadata: Metadata = { title: 'Business cases' };

export default function Page() {
  return (
    <>
      <PageHeader title="Business cases" subtitle="Keep, rebuild or repower, truck by truck, with NPV, payback and a capital plan." />
      <EmptyState title="No business cases yet">A business case takes a selection of trucks and an assumption set and computes, for every truck, the NPV of keeping, rebuilding and repowering, the best policy, IRR, payback, fuel and CO2; then ranks the trucks and plans the swaps under a capital budget.</EmptyState>
      <SafetyCaution />
    </>
  );
}
