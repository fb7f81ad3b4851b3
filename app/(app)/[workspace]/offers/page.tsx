import type { Metadata } from 'next';
import { OfferList } from '@/components/fleet/offer-list';
import { toWorkspaceView } from '@/components/fleet/workspace-view';
import { PageHeader } from '@/components/ui/page-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Repower offers' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const ws = toWorkspaceView(await getPageAccess(workspace));
  return (
    <>
      <PageHeader title="Repower offers" subtitle="Supplier quotes for an engine module: price, install, core credit, days down, timing and productivity gain." />
      <OfferList ws={ws} />
      <SafetyCaution />
    </>
  );
}
