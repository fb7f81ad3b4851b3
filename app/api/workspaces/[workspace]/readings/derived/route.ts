import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { listDerived } from '@/lib/db/queries/readings';
import { parseOr422, route } from '@/lib/http';
import { windowMonthsSchema } from '@/lib/validation/readings';
import { z } from '@/lib/validation/zod';

/** GET `?window=N` (months, 1–60, default 12): every truck's register figures beside those derived from its readings. */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  const raw = new URL(req.url).searchParams.get('window');
  const { window: windowMonths } = parseOr422(z.object({ window: windowMonthsSchema }), { window: raw === null ? 12 : /^\d{1,4}$/.test(raw) ? Number(raw) : raw });
  return NextResponse.json({ windowMonths, items: await listDerived(db(), access.workspace.id, windowMonths) });
});
