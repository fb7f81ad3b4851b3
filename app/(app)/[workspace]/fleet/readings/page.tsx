import type { Metadata } from 'next';
import Link from 'next/link';
import { toWorkspaceView } from '@/components/fleet/workspace-view';
import { ReadingsPage } from '@/components/readings/readings-page';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';
import { READING_COLUMNS } from '@/lib/readings/import-plan';

export const metadata: Metadata = { title: 'Readings' };

export default async function Page({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const ws = toWorkspaceView(await getPageAccess(workspace));
  return (
    <>
      <PageHeader
        title="Readings"
        subtitle="Monthly hour-meter, fuel and event readings per truck, and the register figures they give."
        action={<Link className="btn" href={`/${workspace}/fleet`}>Fleet register</Link>}
      />
      <ReadingsPage ws={ws} columns={READING_COLUMNS.map((c) => ({ name: c.name, required: c.required, help: c.help }))} />
    </>
  );
}
