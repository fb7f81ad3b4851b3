import type { Metadata } from 'next';
import { ApprovalsSettingForm } from '@/components/approvals/approvals-setting-form';
import { EmptyState } from '@/components/ui/empty-state';
import { PageHeader } from '@/components/ui/page-header';
import { hasRole } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';

export const metadata: Metadata = { title: 'Settings' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  return (
    <>
      <PageHeader title="Settings" subtitle="Currency, display units and approval rules for this workspace." />
      <h2 className="mb-2 text-sm font-semibold">Approvals</h2>
      <ApprovalsSettingForm workspace={workspace} current={access.workspace.settings.approvalsRequired} canEdit={hasRole(access, CAN.administer)} />
      <div className="mt-6">
        <EmptyState title="Display settings">Display units (metric or US customary) and how negative amounts are shown.</EmptyState>
      </div>
    </>
  );
}
