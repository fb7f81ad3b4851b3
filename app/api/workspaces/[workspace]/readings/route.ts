import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { createReading, listReadings, readReading } from '@/lib/db/queries/readings';
import { parseOr422, readJson, readQueryId, route } from '@/lib/http';
import { readingInputSchema } from '@/lib/validation/readings';

/** GET: the workspace's monthly readings (`?truck=ID`: one truck's). POST: add one reading (analyst, admin), audited. */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  const truck = readQueryId(new URL(req.url).searchParams, 'truck', 'must be a truck id (a whole number from 1 to 999,999,999)');
  return NextResponse.json({ items: await listReadings(db(), access.workspace.id, truck ?? undefined) });
});

export const POST = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.edit);
  const input = parseOr422(readingInputSchema, await readJson(req));
  const id = await db().transaction((trx) => createReading(trx, access, input));
  return NextResponse.json(await readReading(db(), access.workspace.id, id), { status: 201 });
});
