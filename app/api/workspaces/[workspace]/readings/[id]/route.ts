import { NextResponse } from 'next/server';
import { versionFromQuery } from '@/lib/api/crud';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { deleteReading, readReading, updateReading } from '@/lib/db/queries/readings';
import { idParams, notFound, parseOr422, readJson, readParams, route } from '@/lib/http';
import { readingUpdateSchema } from '@/lib/validation/readings';

type P = { workspace: string; id: string };

/** GET: one reading. PUT: change it with the version loaded (409 when stale). DELETE (?version=): remove it. Audited. */
export const GET = route<P>(async (_req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.read);
  const row = await readReading(db(), access.workspace.id, readParams(idParams, p).id);
  if (!row) throw notFound('No such reading in this workspace.');
  return NextResponse.json(row);
});

export const PUT = route<P>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id } = readParams(idParams, p);
  const { version, ...input } = parseOr422(readingUpdateSchema, await readJson(req));
  await db().transaction((trx) => updateReading(trx, access, id, version, input));
  return NextResponse.json(await readReading(db(), access.workspace.id, id));
});

export const DELETE = route<P>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { id } = readParams(idParams, p);
  const version = versionFromQuery(req);
  await db().transaction((trx) => deleteReading(trx, access, id, version));
  return NextResponse.json({ ok: true });
});
