import type { Metadata } from 'next';
import { FleetImport } from '@/components/fleet/fleet-import';
import { toWorkspaceView } from '@/components/fleet/workspace-view';
import { AccessDenied } from '@/components/ui/access-denied';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { FLEET_COLUMNS } from '@/lib/import/columns';

export const metadata: Metadata = { title: 'Import fleet' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const ws = toWorkspaceView(access);
  if (!ws.canEdit) return <AccessDenied need={CAN.edit} have={access.role} />;
  return (
    <>
      <PageHeader title="Import fleet" subtitle="Bring trucks in from a CSV or XLSX file: checked row by row, saved all or nothing." />
      <FleetImport ws={ws} columns={FLEET_COLUMNS} />
    </>
  );
}
