import { NextResponse } from 'next/server';
import { parseOr422, readJson, route } from '@/lib/http';
import { checkMonteCarlo } from '@/lib/risk/requests';
import { CAN_RUN_RISK, loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';
import { listRuns, startRun } from '@/lib/risk/runs';
import { monteCarloRequestSchema } from '@/lib/validation/risk';

/** The case's latest Monte Carlo runs (without results). */
export const GET = route<CaseParams>(async (_req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params);
  return NextResponse.json({ runs: await listRuns(access.workspace.id, risk.id) });
});

/** Start a run in worker threads; answers 202 with the run id to poll. */
export const POST = route<CaseParams>(async (req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params, CAN_RUN_RISK);
  const spec = parseOr422(monteCarloRequestSchema, await readJson(req));
  checkMonteCarlo(risk.caseFile, spec);
  const run = await startRun({ workspaceId: access.workspace.id, caseId: risk.id, userId: access.userId, caseFile: risk.caseFile, spec });
  return NextResponse.json({ run }, { status: 202 });
});
