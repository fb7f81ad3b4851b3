import { NextResponse } from 'next/server';
import { parseOr422, readJson, route } from '@/lib/http';
import { needsProposal } from '@/lib/risk/requests';
import { loadProposal } from '@/lib/risk/case-source';
import { runBreakEvenOffThread } from '@/lib/sensitivity/break-even-off-thread';
import { loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';
import { breakEvenRequestSchema } from '@/lib/validation/risk';

/**
 * Computed on the case from stored data; changes nothing, so any member may ask (POST for the body only).
 * Seconds of engine work for a fleet's drivers: it runs in a worker thread (lib/sensitivity/break-even-off-thread.ts).
 */
export const POST = route<CaseParams>(async (req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params);
  const body = parseOr422(breakEvenRequestSchema, await readJson(req));
  const proposal = needsProposal(body.metric) ? await loadProposal(access, risk) : null;
  return NextResponse.json(await runBreakEvenOffThread(risk.caseFile, proposal, body));
});
