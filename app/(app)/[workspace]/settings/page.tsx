import type { Metadata } from 'next';
import { ApprovalsSettingForm } from '@/components/approvals/approvals-setting-form';
import { DisplaySettings } from '@/components/fleet/display-settings';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';

export const metadata: Metadata = { title: 'Settings' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const { units, negativeStyle, approvalsRequired, fiscalYearStartMonth, numberFormat, actualsTolerancePercent } = access.workspace.settings;
  return (
    <>
      <PageHeader title="Settings" subtitle={`Currency ${access.workspace.currency}; display units, how negative amounts are shown, how numbers are typed, the month the fiscal year starts and the plan-against-actual tolerance; approval rule.`} />
      <DisplaySettings slug={workspace} initial={{ units, negativeStyle, fiscalYearStartMonth, numberFormat, actualsTolerancePercent }} canEdit={access.role === 'admin'} />
      <h2 className="mb-2 mt-6 text-sm font-semibold">Approvals</h2>
      {access.role === 'admin' ? (
        <ApprovalsSettingForm workspace={workspace} current={approvalsRequired} canEdit />
      ) : (
        <p className="card p-4 text-sm" data-testid="approvals-setting">
          A case needs {approvalsRequired} distinct approval{approvalsRequired === 1 ? '' : 's'} (not counting the person who submitted it).
          <span className="mt-1 block text-xs text-muted">Only a workspace admin can change this.</span>
        </p>
      )}
    </>
  );
}
