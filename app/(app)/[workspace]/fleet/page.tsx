import type { Metadata } from 'next';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';

export const metadata: Metadata = { title: 'Fleet register' };

export default function Page() {
  return (
    <>
      <PageHeader title="Fleet register" subtitle="Trucks with engine hours, annual hours, duty and measured fuel burn." />
      <EmptyState title="No trucks yet">Each truck's unit number, payload class, engine type, engine hours, remaining life, annual operating hours, load factor, productivity (t/h) and measured fuel burn belong here. Import them from a CSV or XLSX file, or add them one by one.</EmptyState>
    </>
  );
}
