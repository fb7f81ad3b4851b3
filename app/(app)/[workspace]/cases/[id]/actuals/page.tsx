import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { CaseNav } from '@/components/cases/case-nav';
import { PlanVsActualPanel } from '@/components/readings/plan-vs-actual';
import { ReforecastPanel } from '@/components/readings/reforecast-panel';
import { PageHeader } from '@/components/ui/page-header';
import { PrintHeader } from '@/components/ui/print-header';
import { getPageAccess } from '@/lib/auth/page-access';
import { CAN } from '@/lib/auth/roles';
import { fetchCase } from '@/lib/db/queries/cases';
import { idParams } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';
import { HttpError } from '@/lib/http';
import { loadPlanVsActual, type PlanVsActualView } from '@/lib/readings/plan-vs-actual-load';

export const metadata: Metadata = { title: 'Plan against actual' };

export default async function ActualsPage({ params }: { params: Promise<{ workspace: string; id: string }> }) {
  const p = await params;
  const { workspace } = p;
  const access = await getPageAccess(workspace);
  const c = await fetchCase(access.workspace.id, readPageParams(idParams, p).id);
  if (!c) notFound();
  let view: PlanVsActualView | null = null;
  let why = '';
  try {
    view = await loadPlanVsActual(access, c.id);
  } catch (e) {
    if (!(e instanceof HttpError) || e.status !== 404) throw e;
    why = e.message;
  }
  return (
    <>
      <PrintHeader caseName={c.name} workspaceName={access.workspace.name} what="Plan against actual" />
      <PageHeader title={`${c.name}: plan against actual`} subtitle="What the approved case promised, truck by truck, against the readings recorded since its approval." />
      <CaseNav slug={workspace} caseId={c.id} current="actuals" />
      {view ? (
        <>
          <PlanVsActualPanel view={view} negativeStyle={access.workspace.settings.negativeStyle} />
          {/* whoever may create cases; the route checks the role again */}
          {(CAN.edit as readonly string[]).includes(access.role) ? <ReforecastPanel slug={workspace} caseId={c.id} /> : null}
        </>
      ) : (
        <p className="card p-4 text-sm" data-testid="actuals-unavailable">{why} <Link className="text-accent underline" href={`/${workspace}/cases/${c.id}`}>Back to the case</Link></p>
      )}
    </>
  );
}
