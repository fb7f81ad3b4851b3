import { NextResponse } from 'next/server';
import { parseOr422, readJson, route } from '@/lib/http';
import { needsProposal, runBreakEven } from '@/lib/risk/requests';
import { loadProposal } from '@/lib/risk/case-source';
import { loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';
import { breakEvenRequestSchema } from '@/lib/validation/risk';

/** Computed on the case from stored data; changes nothing, so any member may ask (POST for the body only). */
export const POST = route<CaseParams>(async (req, { params }) => {
  const { access, risk } = await loadCaseForRoute(params);
  const body = parseOr422(breakEvenRequestSchema, await readJson(req));
  const proposal = needsProposal(body.metric) ? await loadProposal(access, risk) : null;
  return NextResponse.json(runBreakEven(risk.caseFile, proposal, body));
});
