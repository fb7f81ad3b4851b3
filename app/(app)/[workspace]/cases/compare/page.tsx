import type { Metadata } from 'next';
import Link from 'next/link';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';
import { CaseCompare } from './case-compare';

export const metadata: Metadata = { title: 'Compare cases' };

type Props = { params: Promise<{ workspace: string }>; searchParams: Promise<{ a?: string; b?: string }> };

const idOrNull = (raw: string | undefined) => (raw && /^\d{1,9}$/.test(raw) && Number(raw) > 0 ? Number(raw) : null);

export default async function CompareCasesPage({ params, searchParams }: Props) {
  const { workspace } = await params;
  const { a, b } = await searchParams;
  await getPageAccess(workspace);
  return (
    <>
      <PageHeader
        title="Compare two cases"
        subtitle={<>What changed in the inputs and in the results from case A to case B, largest changes first. <Link className="text-accent underline" href={`/${workspace}/cases`}>All cases</Link></>}
      />
      <CaseCompare slug={workspace} initialA={idOrNull(a)} initialB={idOrNull(b)} />
    </>
  );
}
