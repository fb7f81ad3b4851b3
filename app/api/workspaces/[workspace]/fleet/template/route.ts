import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { invalid, route } from '@/lib/http';
import { fleetTemplateCsv, fleetTemplateXlsx } from '@/lib/import/template';

/** GET ?format=csv|xlsx: the fleet import template (any member). */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  const format = new URL(req.url).searchParams.get('format') ?? 'csv';
  if (format === 'csv') {
    return new NextResponse(fleetTemplateCsv(), {
      headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': 'attachment; filename="fleet-template.csv"' },
    });
  }
  if (format !== 'xlsx') throw invalid([{ path: 'format', message: 'must be "csv" or "xlsx"' }]);
  const wsId = access.workspace.id;
  const [engines, offers] = await Promise.all([
    db()('engine_types').where({ workspaceId: wsId }).orderBy('key').pluck('key'),
    db()('repower_offers').where({ workspaceId: wsId }).orderBy('key').pluck('key'),
  ]);
  const bytes = await fleetTemplateXlsx({ engines, offers });
  return new NextResponse(bytes as BodyInit, {
    headers: {
      'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      'content-disposition': 'attachment; filename="fleet-template.xlsx"',
    },
  });
});
