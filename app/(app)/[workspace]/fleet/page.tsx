import type { Metadata } from 'next';
import Link from 'next/link';
import { CaseFilePanel } from '@/components/fleet/case-file-panel';
import { FleetRegister } from '@/components/fleet/fleet-register';
import { toWorkspaceView } from '@/components/fleet/workspace-view';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Fleet register' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const ws = toWorkspaceView(await getPageAccess(workspace));
  return (
    <>
      <PageHeader
        title="Fleet register"
        subtitle="Trucks with engine hours, annual hours, duty and measured fuel burn."
        action={
          <>
            <Link className="btn" href={`/${workspace}/fleet/readings`}>Readings</Link>
            {ws.canEdit ? <Link className="btn" href={`/${workspace}/fleet/import`}>Import from file</Link> : null}
          </>
        }
      />
      <FleetRegister ws={ws} />
      <CaseFilePanel ws={ws} />
    </>
  );
}
