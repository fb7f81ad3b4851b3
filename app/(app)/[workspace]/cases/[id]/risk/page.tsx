import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { CaseNav } from '@/components/cases/case-nav';
import { RiskWorkbench } from '@/components/risk/risk-workbench';
import { PageHeader } from '@/components/ui/page-header';
import { PrintHeader } from '@/components/ui/print-header';
import { SafetyCaution } from '@/components/ui/safety-caution';
import { getPageAccess } from '@/lib/auth/page-access';
import { db } from '@/lib/db';
import { formatMoney, formatPercent, type NegativeStyle } from '@/lib/format';
import { idParams } from '@/lib/http';
import { readPageParams } from '@/lib/http/page-params';
import { CAN_RUN_RISK } from '@/lib/risk/route-context';
import { fetchPinnedRun, type PinnedRun } from '@/lib/risk/runs';

export const metadata: Metadata = { title: 'Sensitivity and risk' };

const utc = (iso: string) => `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;

/** The header's line on the pinned Monte Carlo run: who ran what, when, and what it found. */
function PinnedLine({ run, currency, negative, status }: { run: PinnedRun | null; currency: string; negative: NegativeStyle; status: string }) {
  if (!run) {
    return (
      <span className="mt-1 block text-sm text-ink" data-testid="risk-pinned">
        No Monte Carlo run is pinned to this case{status === 'draft' || status === 'returned' ? '; pin a finished run read on the proposal below.' : '.'}
      </span>
    );
  }
  const m = (x: number) => formatMoney(x, { scale: 'M', negative, digits: 2 });
  return (
    <span className="mt-1 block text-sm text-ink" data-testid="risk-pinned">
      <strong>Pinned Monte Carlo run:</strong> {utc(run.startedAt)} by {run.author ? run.author.name || run.author.email : 'a removed account'}, {run.iterations.toLocaleString('en-US')} iterations, seed {run.seed},{' '}
      failures {run.sampleFailures ? 'sampled' : 'on the median path'}, {run.distributions.length === 1 ? '1 driver' : `${run.distributions.length} drivers`} drawn — {run.measure.label}: chance of a loss{' '}
      <strong>{formatPercent(run.summary.probLoss)}</strong>, P10 / P50 / P90 {m(run.summary.p10)} / {m(run.summary.p50)} / {m(run.summary.p90)} {currency} M.
    </span>
  );
}

/** Sensitivity and risk of one business case; `?truck=ID` opens it on one truck (links from truck pages); `?ranges=uniform` the tornado and spider on ±20 %. */
export default async function Page({ params, searchParams }: { params: Promise<{ workspace: string; id: string }>; searchParams: Promise<{ truck?: string; ranges?: string }> }) {
  const p = await params;
  const { workspace } = p;
  const { truck, ranges } = await searchParams;
  const access = await getPageAccess(workspace);
  const { id: caseId } = readPageParams(idParams, p);
  const row = await db()('business_cases').where({ id: caseId, workspaceId: access.workspace.id }).first('id', 'name', 'status');
  if (!row) notFound();
  const pinned = await fetchPinnedRun(caseId);
  const negative = access.workspace.settings.negativeStyle;
  return (
    <>
      <PrintHeader caseName={row.name} workspaceName={access.workspace.name} what="Sensitivity and risk" />
      <PageHeader
        title={`Sensitivity and risk — ${row.name}`}
        subtitle={
          <>
            Which drivers matter, where the proposal stops paying, and how likely it is to lose money.
            <PinnedLine run={pinned} currency={access.workspace.currency} negative={negative} status={row.status} />
          </>
        }
      />
      <CaseNav slug={workspace} caseId={caseId} current="risk" />
      <RiskWorkbench slug={workspace} caseId={caseId} initialTruck={truck ?? null} initialRanges={ranges === 'uniform' ? 'uniform' : 'realistic'} negative={negative} canRun={CAN_RUN_RISK.includes(access.role)} />
      <SafetyCaution />
    </>
  );
}
