import type { Metadata } from 'next';
import Link from 'next/link';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';
import { idParam } from '@/lib/http';
import { CaseCompare } from './case-compare';

export const metadata: Metadata = { title: 'Compare cases' };

type Props = { params: Promise<{ workspace: string }>; searchParams: Promise<{ a?: string; b?: string }> };

/** A case id from the query by the rule of every id in a URL; anything else leaves that side unchosen. */
const idOrNull = (raw: string | undefined) => {
  const r = idParam.safeParse(raw);
  return r.success ? r.data : null;
};

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
