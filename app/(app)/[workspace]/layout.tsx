import { Rail } from '@/components/shell/rail';
import { Providers } from '@/components/providers';
import { listUserWorkspaces } from '@/lib/auth/access';
import { getPageAccess } from '@/lib/auth/page-access';
import { db } from '@/lib/db';

export const dynamic = 'force-dynamic';

export default async function WorkspaceLayout({ children, params }: { children: React.ReactNode; params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const [workspaces, user] = await Promise.all([
    listUserWorkspaces(access.userId),
    db()('users').where({ id: access.userId }).first('email'),
  ]);
  return (
    <div className="flex min-h-screen">
      <Rail slug={workspace} role={access.role} email={user?.email ?? ''} workspaces={workspaces} />
      <main className="h-screen min-w-0 flex-1 overflow-y-auto px-6 py-5">
        <Providers>{children}</Providers>
      </main>
    </div>
  );
}
