import { NextResponse } from 'next/server';
import { parseOr422, readJson, route } from '@/lib/http';
import { runTwoWay } from '@/lib/risk/requests';
import { loadCaseForRoute, type CaseParams } from '@/lib/risk/route-context';
import { twoWayRequestSchema } from '@/lib/validation/risk';

/** Computed on the case from stored data; changes nothing, so any member may ask (POST for the body only). */
export const POST = route<CaseParams>(async (req, { params }) => {
  const { risk } = await loadCaseForRoute(params);
  const body = parseOr422(twoWayRequestSchema, await readJson(req));
  return NextResponse.json(runTwoWay(risk.caseFile, body));
});
