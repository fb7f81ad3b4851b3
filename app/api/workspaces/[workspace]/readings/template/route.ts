import { NextResponse } from 'next/server';
import { requireMember } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import { db } from '@/lib/db';
import { invalid, route } from '@/lib/http';
import { readingsTemplateCsv, readingsTemplateXlsx } from '@/lib/readings/template';

/** GET ?format=csv|xlsx: the readings import template, header only (any member); the XLSX explains each column with an example. */
export const GET = route<{ workspace: string }>(async (req, { params }) => {
  const access = await requireMember((await params).workspace, CAN.read);
  const format = new URL(req.url).searchParams.get('format') ?? 'csv';
  if (format === 'csv') {
    return new NextResponse(readingsTemplateCsv(), {
      headers: { 'content-type': 'text/csv; charset=utf-8', 'content-disposition': 'attachment; filename="readings-template.csv"' },
    });
  }
  if (format !== 'xlsx') throw invalid([{ path: 'format', message: 'must be "csv" or "xlsx"' }]);
  const wsId = access.workspace.id;
  const [engines, unit] = await Promise.all([
    db()('engine_types').where({ workspaceId: wsId }).orderBy('key').pluck('key'),
    db()('trucks').where({ workspaceId: wsId }).orderBy('unitNumber').first('unitNumber'),
  ]);
  const bytes = await readingsTemplateXlsx({ unit: unit?.unitNumber, engine: engines[0], engines });
  return new NextResponse(bytes as BodyInit, {
    headers: {
      'content-type': 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      'content-disposition': 'attachment; filename="readings-template.xlsx"',
    },
  });
});
