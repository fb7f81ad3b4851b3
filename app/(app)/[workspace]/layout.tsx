import { Rail } from '@/components/shell/rail';
import { Providers } from '@/components/providers';
import { countWaitingForMe } from '@/lib/approvals/queries';
import { listUserWorkspaces } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { db } from '@/lib/db';
import { outboxEnabled } from '@/lib/mail/outbox';

export const dynamic = 'force-dynamic';

export default async function WorkspaceLayout({ children, params }: { children: React.ReactNode; params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const [workspaces, user, waiting] = await Promise.all([
    listUserWorkspaces(access.userId),
    db()('users').where({ id: access.userId }).first('email'),
    countWaitingForMe(access),
  ]);
  return (
    <div className="flex min-h-screen print:block">
      <Rail slug={workspace} role={access.role} email={user?.email ?? ''} workspaces={workspaces} badges={{ '/approvals': waiting }} hidden={outboxEnabled() ? [] : ['/outbox']} />
      <main className="h-screen min-w-0 flex-1 overflow-y-auto px-6 py-5 print:h-auto print:overflow-visible print:p-0">
        <Providers>{children}</Providers>
      </main>
    </div>
  );
}
