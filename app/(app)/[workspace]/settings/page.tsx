import type { Metadata } from 'next';
import { DisplaySettings } from '@/components/fleet/display-settings';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Settings' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const { units, negativeStyle } = access.workspace.settings;
  return (
    <>
      <PageHeader title="Settings" subtitle={`Currency ${access.workspace.currency}; display units and how negative amounts are shown.`} />
      <DisplaySettings slug={workspace} initial={{ units, negativeStyle }} canEdit={access.role === 'admin'} />
    </>
  );
}
