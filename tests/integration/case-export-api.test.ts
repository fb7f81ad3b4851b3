import type { Knex } from 'knex';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import { useDbForTests } from '@/lib/db';
import { evaluateCase } from '@/lib/engine';
import { buildCaseFile } from '@/lib/db/queries/case-file';
import { GET as exportCase } from '@/app/api/workspaces/[workspace]/cases/[id]/export/route';
import { createTestDb, userIds } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const WS = 'aldervane-north-pit';
const url = (id: number, format: string) => `http://127.0.0.1/api/workspaces/${WS}/cases/${id}/export?format=${format}`;

describe.each([{ name: 'SQLite', pg: false }, { name: 'PostgreSQL', pg: true }])('case export API on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let users: Record<string, number>;
  let wsId: number;
  let setId: number;
  let caseId: number;
  let otherCaseId: number;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    users = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    setId = (await k('assumption_sets').where({ workspaceId: wsId, name: 'Base' }).first('id')).id;
    const trucks = await k('trucks').where({ workspaceId: wsId }).orderBy('unitNumber').select('id');
    // a hostile note typed into the register must reach the workbook as text
    await k('trucks').where({ id: trucks[0].id }).update({ notes: '=HYPERLINK("http://example.test","x")' });
    const now = new Date().toISOString();
    const row = { name: 'Export check', assumptionSetId: setId, selection: JSON.stringify(trucks.map((t) => ({ truckId: t.id, repowerOfferId: null }))), status: 'draft', createdAt: now, updatedAt: now };
    [{ id: caseId }] = await k('business_cases').insert({ ...row, workspaceId: wsId }).returning('id');
    const other = (await k('workspaces').where({ slug: 'corrin-flats' }).first('id')).id;
    const otherSet = await k('assumption_sets').where({ workspaceId: other }).first('id');
    [{ id: otherCaseId }] = await k('business_cases').insert({ ...row, workspaceId: other, assumptionSetId: otherSet?.id ?? null, selection: '[]' }).returning('id');
  });
  afterAll(async () => destroy());

  it('answers 401 signed out, 403 to a non-member, 404 for another workspace’s case, 422 for an unknown format', async () => {
    signInAs(null);
    expect((await call(exportCase, { workspace: WS, id: String(caseId) }, { url: url(caseId, 'xlsx') })).status).toBe(401);
    signInAs(users['admin@corrin.test']);
    expect((await call(exportCase, { workspace: WS, id: String(caseId) }, { url: url(caseId, 'xlsx') })).status).toBe(403);
    signInAs(users['viewer@aldervane.test']);
    expect((await call(exportCase, { workspace: WS, id: String(otherCaseId) }, { url: url(otherCaseId, 'xlsx') })).status).toBe(404);
    expect((await call(exportCase, { workspace: WS, id: 'abc' }, { url: url(caseId, 'xlsx') })).status).toBe(404);
    const bad = await call(exportCase, { workspace: WS, id: String(caseId) }, { url: url(caseId, 'pdf') });
    expect(bad.status).toBe(422);
    expect(bad.body.problems[0].path).toBe('format');
  });

  it('gives a viewer the workbook with the engine’s figures, the plan and typed text as text', async () => {
    signInAs(users['viewer@aldervane.test']);
    const r = await call(exportCase, { workspace: WS, id: String(caseId) }, { url: url(caseId, 'xlsx') });
    expect(r.status).toBe(200);
    expect(r.response.headers.get('content-disposition')).toBe('attachment; filename="Export-check.xlsx"');
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(await r.response.arrayBuffer());
    expect(wb.worksheets.map((w) => w.name).slice(0, 3)).toEqual(['Cover', 'Summary', 'Assumptions']);
    expect(wb.getWorksheet('Plan')).toBeTruthy();
    const file = await buildCaseFile(wsId, { name: 'Export check', assumptionSetId: setId }, k);
    const result = evaluateCase(file as Parameters<typeof evaluateCase>[0]);
    const summary = wb.getWorksheet('Summary') as ExcelJS.Worksheet;
    expect((summary.getCell('E5').value as ExcelJS.CellFormulaValue).result).toBe(result.trucks[0].options.repower.npv);
    const trucks = wb.getWorksheet('Trucks') as ExcelJS.Worksheet;
    expect(trucks.getCell('P5').value).toBe('=HYPERLINK("http://example.test","x")');
  });

  it('gives the Summary table as CSV', async () => {
    signInAs(users['analyst@aldervane.test']);
    const r = await call(exportCase, { workspace: WS, id: String(caseId) }, { url: url(caseId, 'csv') });
    expect(r.status).toBe(200);
    expect(r.response.headers.get('content-type')).toContain('text/csv');
    const rows = Papa.parse<string[]>(String(r.body).trim()).data;
    expect(rows).toHaveLength(1 + 24 + 1);
    expect(rows.at(-1)?.[0]).toBe('Fleet');
  });
});
