import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { route } from '@/lib/http';
import { parseCaseId } from '@/lib/risk/case-source';
import { CAN_RUN_RISK } from '@/lib/risk/route-context';
import { cancelRun, readRun } from '@/lib/risk/runs';

type Params = { workspace: string; id: string; job: string };

/** Progress while it runs, then the result. */
export const GET = route<Params>(async (_req, { params }) => {
  const { workspace, id, job } = await params;
  const access = await requireMember(workspace, CAN.read);
  return NextResponse.json({ run: await readRun(access.workspace.id, parseCaseId(id), job) });
});

/** Cancel: the workers stop at their next progress tick and the iterations done are summarised. */
export const DELETE = route<Params>(async (_req, { params }) => {
  const { workspace, id, job } = await params;
  const access = await requireMember(workspace, CAN_RUN_RISK);
  return NextResponse.json({ run: await cancelRun({ workspaceId: access.workspace.id, caseId: parseCaseId(id), runId: job, userId: access.userId }) });
});
