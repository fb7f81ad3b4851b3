import type { Metadata } from 'next';
import { ApprovalsSettingForm } from '@/components/approvals/approvals-setting-form';
import { DisplaySettings } from '@/components/fleet/display-settings';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Settings' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const { units, negativeStyle, approvalsRequired, numberFormat } = access.workspace.settings;
  return (
    <>
      <PageHeader title="Settings" subtitle={`Currency ${access.workspace.currency}; display units and how negative amounts are shown; approval rule.`} />
      <DisplaySettings slug={workspace} initial={{ units, negativeStyle, numberFormat }} canEdit={access.role === 'admin'} />
      <h2 className="mb-2 mt-6 text-sm font-semibold">Approvals</h2>
      <ApprovalsSettingForm workspace={workspace} current={approvalsRequired} canEdit={access.role === 'admin'} />
    </>
  );
}
