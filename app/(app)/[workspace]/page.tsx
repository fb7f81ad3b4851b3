import type { Metadata } from 'next';
import Link from 'next/link';
import { PageHeader } from '@/components/ui/page-header';
import { getPageAccess } from '@/lib/auth/page-access';
import { fetchOverview } from '@/lib/db/queries/overview';
import { fetchWorkspaceCounts } from '@/lib/db/queries/workspace';
import { outboxEnabled } from '@/lib/mail/outbox';
import { ForYou } from './for-you';

export const metadata: Metadata = { title: 'Overview' };

export default async function OverviewPage({ params }: { params: Promise<{ workspace: string }> }) {
  const { workspace } = await params;
  const access = await getPageAccess(workspace);
  const [counts, overview] = await Promise.all([fetchWorkspaceCounts(access.workspace.id), fetchOverview(access)]);
  const tiles = [
    { label: 'Trucks in the register', value: counts.trucks, href: 'fleet' },
    { label: 'Engine types', value: counts.engines, href: 'engines' },
    { label: 'Repower offers', value: counts.offers, href: 'offers' },
    { label: 'Assumption sets', value: counts.assumptionSets, href: 'assumptions' },
    { label: 'Business cases', value: counts.cases, href: 'cases' },
  ];
  return (
    <>
      <PageHeader title={access.workspace.name} subtitle={`Reporting in ${access.workspace.currency}. Keep, rebuild or repower, truck by truck.`} />
      <ForYou slug={workspace} overview={overview} outboxShown={outboxEnabled()} />
      <dl className="grid grid-cols-2 gap-3 md:grid-cols-5" data-testid="overview-counts">
        {tiles.map((t) => (
          <Link key={t.href} href={`/${workspace}/${t.href}`} className="card block p-4 hover:border-muted">
            <dt className="text-xs text-muted">{t.label}</dt>
            <dd className="num mt-1 text-2xl font-semibold">{t.value.toLocaleString('en-US')}</dd>
          </Link>
        ))}
      </dl>
      <section className="card mt-6 p-4 text-sm">
        <h2 className="font-semibold">The job, in order</h2>
        <ol className="mt-2 list-decimal space-y-1 pl-5 text-muted">
          <li>Bring the fleet in (engine hours, annual hours, load factor, t/h, measured fuel burn).</li>
          <li>Describe each engine type and each repower offer.</li>
          <li>Set the economic assumptions: discount rate, fuel price and escalation, tax and depreciation.</li>
          <li>Build a business case: NPV of keep, rebuild and repower for every truck, ranked, within a capital budget.</li>
          <li>Test it: sensitivity, break-even and Monte Carlo; submit it for approval; export the workbook.</li>
        </ol>
      </section>
    </>
  );
}
