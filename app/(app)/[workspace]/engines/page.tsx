import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';

export const metadata: Metadata = { title: 'Engine library' };

export default function Page() {
  return (
    <>
      <PageHeader title="Engine library" subtitle="Rating, BSFC, planned life, failure behaviour and service figures per engine type." />
      <EmptyState title="No engine types yet">Each engine type in service or on offer: rated power (kW), BSFC (g/kWh), planned life (h), Weibull shape and scale, overhaul and failure cost and days down, oil-service interval, sump, kit and labour.</EmptyState>
    </>
  );
}
