import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { idParams, readParams, route } from '@/lib/http';
import { CAN_RUN_RISK } from '@/lib/risk/route-context';
import { cancelRun, readRun } from '@/lib/risk/runs';
import { runIdParam } from '@/lib/validation/risk';

type Params = { workspace: string; id: string; job: string };

/** The case id and the run's id (a UUID); anything else is a 404. */
const runParams = idParams.extend({ job: runIdParam });

/** Progress while it runs, then the result. */
export const GET = route<Params>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const { id, job } = readParams(runParams, p);
  return NextResponse.json({ run: await readRun(access.workspace.id, id, job) });
});

/** Cancel: the workers stop at their next progress tick and the iterations done are summarised. */
export const DELETE = route<Params>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN_RUN_RISK);
  const { id, job } = readParams(runParams, p);
  return NextResponse.json({ run: await cancelRun({ workspaceId: access.workspace.id, caseId: id, runId: job, userId: access.userId }) });
});
