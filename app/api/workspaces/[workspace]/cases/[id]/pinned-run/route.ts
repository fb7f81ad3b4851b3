import { NextResponse } from 'next/server';
import { versionFromQuery } from '@/lib/api/crud';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { idParams, notFound, parseOr422, readJson, readParams, route } from '@/lib/http';
import { CAN_RUN_RISK, type CaseParams } from '@/lib/risk/route-context';
import { fetchPinnedRun, pinRun, unpinRun } from '@/lib/risk/runs';
import { pinRunSchema } from '@/lib/validation/risk';

async function caseOf(workspaceId: number, params: CaseParams): Promise<number> {
  const { id: caseId } = readParams(idParams, params);
  const row = await db()('business_cases').where({ id: caseId, workspaceId }).first('id');
  if (!row) throw notFound('No such business case in this workspace.');
  return caseId;
}

/** The case's pinned Monte Carlo run (settings, author, times, summary), or `{ run: null }`; any member reads. */
export const GET = route<CaseParams>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  return NextResponse.json({ run: await fetchPinnedRun(await caseOf(access.workspace.id, p)) });
});

/** PUT { runId, version }: pin a finished run read on the proposal (analyst, approver, admin; draft or returned case). */
export const PUT = route<CaseParams>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN_RUN_RISK);
  const caseId = await caseOf(access.workspace.id, p);
  const body = parseOr422(pinRunSchema, await readJson(req));
  const r = await pinRun({ workspaceId: access.workspace.id, caseId, userId: access.userId, runId: body.runId, version: body.version });
  return NextResponse.json({ ...r, run: await fetchPinnedRun(caseId) });
});

/** DELETE ?version=N: unpin (same roles and states as pinning). */
export const DELETE = route<CaseParams>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN_RUN_RISK);
  const caseId = await caseOf(access.workspace.id, p);
  const r = await unpinRun({ workspaceId: access.workspace.id, caseId, userId: access.userId, version: versionFromQuery(req) });
  return NextResponse.json(r);
});
