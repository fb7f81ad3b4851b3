import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { createReforecast, previewReforecast } from '@/lib/db/queries/reforecast';
import { idParams, parseOr422, readJson, readParams, route } from '@/lib/http';
import { DEFAULT_WINDOW_MONTHS, reforecastSchema, windowMonthsSchema } from '@/lib/validation/readings';
import { z } from '@/lib/validation/zod';

/**
 * GET `?window=N` (months, 1–60, default 12): the re-forecast's preview — per
 * truck the approved case's figures, those its readings give (date, window)
 * and which will change. Whoever may create cases (analysts, admins); 409 for
 * a case that is not approved.
 */
export const GET = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const caseId = readParams(idParams, p).id;
  const raw = new URL(req.url).searchParams.get('window');
  const { window: windowMonths } = parseOr422(z.object({ window: windowMonthsSchema }), { window: raw === null ? DEFAULT_WINDOW_MONTHS : /^\d{1,4}$/.test(raw) ? Number(raw) : raw });
  return NextResponse.json(await previewReforecast(db(), access, caseId, windowMonths));
});

/**
 * POST `{ windowMonths?, name? }`: a new draft from the approved case with its
 * trucks' figures from their readings, its plan starting the month after the
 * latest reading; one transaction with the audit row `reforecast`. 201 with
 * the new case's id; 409 for a case that is not approved or has no readings.
 */
export const POST = route<{ workspace: string; id: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const caseId = readParams(idParams, p).id;
  const input = parseOr422(reforecastSchema, await readJson(req));
  const created = await db().transaction((trx) => createReforecast(trx, access, caseId, input));
  return NextResponse.json({ case: { id: created.id, name: created.name }, preview: created.preview }, { status: 201 });
});
