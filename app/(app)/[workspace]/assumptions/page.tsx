import type { Metadata } from 'next';
import { AssumptionSets } from '@/components/fleet/assumption-sets';
import { toWorkspaceView } from '@/components/fleet/workspace-view';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Assumptions' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const ws = toWorkspaceView(await getPageAccess(workspace));
  return (
    <>
      <PageHeader title="Assumptions" subtitle="Named sets of economic assumptions: discount rate, inflation, fuel, lube, labour, carbon, margin, tax and depreciation." />
      <AssumptionSets ws={ws} />
    </>
  );
}
