import type { Metadata } from 'next';
import { EngineLibrary } from '@/components/fleet/engine-library';
import { toWorkspaceView } from '@/components/fleet/workspace-view';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Engine library' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const ws = toWorkspaceView(await getPageAccess(workspace));
  return (
    <>
      <PageHeader title="Engine library" subtitle="Rating, fuel consumption, planned life, failure behaviour, overhaul and failure costs, oil-service figures." />
      <EngineLibrary ws={ws} />
    </>
  );
}
