import { NextResponse } from 'next/server';
import { db } from '@/lib/db';
import { parseOr422, readJson, route } from '@/lib/http';
import { checkMonteCarlo } from '@/lib/risk/requests';
import { loadProposal } from '@/lib/risk/case-source';
import { CAN_RUN_RISK, loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';
import { listRuns, startRun } from '@/lib/risk/runs';
import { monteCarloRequestSchema } from '@/lib/validation/risk';

/**
 * The case's latest Monte Carlo runs (without results), with the pinned run's
 * id and the case's version and status (what a pin or unpin sends back).
 */
export const GET = route<CaseParams>(async (_req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params);
  const c = await db()('business_cases').where({ id: risk.id }).first('version', 'status', 'pinnedRunId');
  return NextResponse.json({ runs: await listRuns(access.workspace.id, risk.id), pinnedRunId: c.pinnedRunId ?? null, caseVersion: Number(c.version), caseStatus: c.status });
});

/** Start a run in worker threads; answers 202 with the run id to poll. */
export const POST = route<CaseParams>(async (req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params, CAN_RUN_RISK);
  const spec = parseOr422(monteCarloRequestSchema, await readJson(req));
  checkMonteCarlo(risk.caseFile, spec);
  // every run sums the proposal too (its policies held fixed), whatever it is read on, and keeps the policies it used
  // (a repowered truck is simulated at its offer's repower: the sampled paths do not follow a later or delayed timing)
  const { policies: proposal } = await loadProposal(access, risk);
  const run = await startRun({ workspaceId: access.workspace.id, caseId: risk.id, userId: access.userId, caseFile: risk.caseFile, spec: { ...spec, proposal } });
  return NextResponse.json({ run }, { status: 202 });
});
