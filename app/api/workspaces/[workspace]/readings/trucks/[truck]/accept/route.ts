import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { acceptDerived } from '@/lib/db/queries/readings';
import { idParam, parseOr422, readJson, readParams, route } from '@/lib/http';
import { z } from '@/lib/validation/zod';
import { acceptSchema } from '@/lib/validation/readings';

/**
 * POST `{ version, windowMonths, fields }`: "Use these figures" — writes the
 * chosen figures derived from the truck's readings to the truck (analyst,
 * admin), with the truck's version (409 when stale), audited.
 */
/** The register truck's id (a number, not its unit number). */
const truckParams = z.object({ truck: idParam });

export const POST = route<{ workspace: string; truck: string }>(async (req, { params }) => {
  const p = await params;
  const access = await requireMember(p.workspace, CAN.edit);
  const { truck: truckId } = readParams(truckParams, p);
  const body = parseOr422(acceptSchema, await readJson(req));
  const saved = await db().transaction((trx) => acceptDerived(trx, access, truckId, body));
  return NextResponse.json(saved);
});
