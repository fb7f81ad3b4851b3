import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { POST as importFleet } from '@/app/api/workspaces/[workspace]/fleet/import/route';
import { GET as getTemplate } from '@/app/api/workspaces/[workspace]/fleet/template/route';
import { FLEET_COLUMNS } from '@/lib/import/columns';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { snapshotWorkspace, userIds, WS } from './support/fleet-fixtures';
import { workbookParts, writeZip } from '../support/zip-writer';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const HEADER = FLEET_COLUMNS.map((c) => c.name);
type R = Record<string, string | number>;
const row = (unit: string, over: R = {}): R => ({
  unit_number: unit, payload_class: '300 t', engine_type: 'ac-2600-legacy', repower_offer: 'kestrel-km2700', engine_hours_h: 9000,
  remaining_life_h: 48000, annual_hours_h: 6100, load_factor: 0.47, tonnes_per_hour: 790, fuel_burn_l_per_h: '', notes: 'imported', ...over,
});
// Papa quotes cells with commas and quotes, as a spreadsheet program would.
const csv = (rows: R[], header = HEADER) => Papa.unparse([header, ...rows.map((r) => header.map((h) => String(r[h] ?? '')))]);
const form = (name: string, content: string | Uint8Array, mode = 'preview') => {
  const f = new FormData();
  f.set('file', new File([content as BlobPart], name));
  f.set('mode', mode);
  return f;
};
async function xlsx(rows: Array<Array<ExcelJS.CellValue>>): Promise<Uint8Array> {
  const wb = new ExcelJS.Workbook();
  const ws = wb.addWorksheet('Fleet');
  for (const r of rows) ws.addRow(r);
  return new Uint8Array(await wb.xlsx.writeBuffer());
}

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('fleet import on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    signInAs(ids['analyst@aldervane.test']);
  });
  afterAll(async () => destroy());

  /** Preview and commit both refuse the file with `expected`, and nothing is saved. */
  async function expectRefused(name: string, content: string | Uint8Array, expected: RegExp) {
    const before = await snapshotWorkspace(k, WS);
    const preview = await call(importFleet, { workspace: WS }, { body: form(name, content) });
    const commit = await call(importFleet, { workspace: WS }, { body: form(name, content, 'commit') });
    expect(commit.status).toBe(422);
    const said = (r: typeof preview) =>
      [r.body.error, ...(r.body.problems ?? []).map((p: { path: string; message: string }) => `${p.path}: ${p.message}`)].join('\n');
    expect(said(commit)).toMatch(expected);
    if (preview.status === 200) {
      expect(preview.body.ok).toBe(false);
      const rows = preview.body.rowProblems.map((p: { row: number; column: string; message: string }) => `row ${p.row}, ${p.column}: ${p.message}`);
      expect(rows.join('\n')).toMatch(expected);
    } else {
      expect(preview.status).toBe(422);
      expect(said(preview)).toMatch(expected);
    }
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
    return commit.body;
  }

  it('refuses a file of the wrong type (a PDF named .csv, a text file)', async () => {
    await expectRefused('fleet.csv', '%PDF-1.7\n\u0000\u0001binary', /"fleet\.csv" is not a CSV or XLSX file/);
    await expectRefused('fleet.txt', csv([row('T9-01')]), /not a CSV or XLSX file/);
    await expectRefused('fleet.xlsx', csv([row('T9-01')]), /not a CSV or XLSX file/);
  });

  it('refuses an empty file and a header with no rows', async () => {
    await expectRefused('fleet.csv', '', /The file is empty/);
    await expectRefused('fleet.csv', HEADER.join(','), /header but no data rows/);
  });

  it('refuses a file with a missing column, naming it', async () => {
    const header = HEADER.filter((h) => h !== 'annual_hours_h');
    const body = await expectRefused('fleet.csv', csv([row('T9-01')], header), /row 1, annual_hours_h: column is missing/);
    expect(body.problems).toHaveLength(1);
  });

  it('refuses a bad number on row 7 with its row, column and reason', async () => {
    const rows = [1, 2, 3, 4, 5, 6, 7].map((i) => row(`T9-0${i}`));
    rows[5] = row('T9-06', { engine_hours_h: '12k' }); // file row 7: the header is row 1
    const body = await expectRefused('fleet.csv', csv(rows), /row 7, engine_hours_h: "12k" is not a number: enter a number such as 18,950/);
    expect(body.problems).toEqual([{ path: 'row 7, engine_hours_h', message: '"12k" is not a number: enter a number such as 18,950' }]);
  });

  it('refuses 10,001 rows with the limit in the message', async () => {
    const rows = Array.from({ length: 10_001 }, (_, i) => row(`U${i}`));
    await expectRefused('fleet.csv', csv(rows), /10,001 data rows; the limit is 10,000/);
  });

  it('refuses a CSV saved in Latin-1, naming the line and suggesting "CSV UTF-8" (issue 12)', async () => {
    const bytes = Uint8Array.from(Buffer.from(csv([row('T9-01', { notes: 'Révision' })]), 'latin1'));
    await expectRefused('fleet.csv', bytes, /The file is not UTF-8 text \(the byte at offset \d+, on line 2, is 0xE9\).*"CSV UTF-8 \(Comma delimited\)"/);
  });

  it('refuses an XLSX whose sheet declares 60 MB before unpacking anything (issue 12)', async () => {
    const bomb = writeZip([...workbookParts(), { name: 'xl/worksheets/sheet1.xml', deflated: Buffer.alloc(1024 * 1024), declaredSize: 60 * 1024 * 1024 }]);
    await expectRefused('fleet.xlsx', bomb, /The workbook part "xl\/worksheets\/sheet1\.xml" unpacks to 60 MB; the limit is 50 MB per part/);
  });

  it('refuses a text cell starting with "=" (a formula) and a negative hour count', async () => {
    const rows = [row('T9-01', { notes: '=HYPERLINK("http://example.invalid","x")' }), row('T9-02', { engine_hours_h: -5 })];
    const body = await expectRefused('fleet.csv', csv(rows), /row 2, notes: must not start with =, \+, - or @/);
    expect(body.problems).toContainEqual({ path: 'row 3, engine_hours_h', message: 'must not be negative' });
  });

  it('refuses unknown engine keys and a unit number twice in the file', async () => {
    const rows = [row('T9-01', { engine_type: 'no-such-engine' }), row('T9-02'), row('T9-02')];
    const body = await expectRefused('fleet.csv', csv(rows), /row 2, engine_type: no engine type has the key "no-such-engine"/);
    expect(body.problems).toContainEqual({ path: 'row 4, unit_number', message: '"T9-02" is already on row 3' });
  });

  it('reads numbers by the workspace format, as the forms do: a decimal comma workspace takes 18.950 and 0,47, and no one takes 1e3', async () => {
    await expectRefused('fleet.csv', csv([row('T9-05', { engine_hours_h: '1e3' })]), /row 2, engine_hours_h: "1e3" is not a number: write the number in full, without an exponent \(e\)/);
    await expectRefused('fleet.csv', csv([row('T9-05', { load_factor: '0,47' })]), /row 2, load_factor: "0,47" is not a number: enter a number such as 0\.47 \(this workspace writes decimals with a point\)/);
    const wsRow = await k('workspaces').where({ slug: WS }).first('id', 'settings');
    await k('workspaces').where({ id: wsRow.id }).update({ settings: JSON.stringify({ ...JSON.parse(wsRow.settings || '{}'), numberFormat: 'comma' }) });
    try {
      const rows = [row('T9-05', { engine_hours_h: '18.950', load_factor: '0,47', tonnes_per_hour: '1 234,5' })];
      const commit = await call(importFleet, { workspace: WS }, { body: form('fleet.csv', csv(rows), 'commit') });
      expect(commit.status).toBe(200);
      expect(await k('trucks').where({ unitNumber: 'T9-05' }).first()).toMatchObject({ engineHours: 18950, loadFactor: 0.47, tonnesPerHour: 1234.5 });
      await k('trucks').where({ unitNumber: 'T9-05' }).delete();
    } finally {
      await k('workspaces').where({ id: wsRow.id }).update({ settings: wsRow.settings });
    }
  });

  it('refuses a formula cell in an XLSX file', async () => {
    const bytes = await xlsx([HEADER, HEADER.map((h) => (h === 'notes' ? { formula: 'A1&"x"', result: 'x' } : row('T9-01')[h]))]);
    await expectRefused('fleet.xlsx', bytes, /row 2, notes: is a formula/);
  });

  it('previews, then imports every row of a good CSV in one go: new units created, known ones updated', async () => {
    const rows = [row('T3-01', { engine_hours_h: '1,250' }), row('T9-01'), row('T9-02', { fuel_burn_l_per_h: 245.5, repower_offer: '' })];
    const before = await snapshotWorkspace(k, WS);
    const preview = await call(importFleet, { workspace: WS }, { body: form('fleet.csv', `\ufeff${csv(rows)}\n\n`) });
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({ ok: true, creates: 2, updates: 1, rowProblems: [] });
    expect(preview.body.rows).toEqual([
      { row: 2, unitNumber: 'T3-01', action: 'update' },
      { row: 3, unitNumber: 'T9-01', action: 'create' },
      { row: 4, unitNumber: 'T9-02', action: 'create' },
    ]);
    expect(await snapshotWorkspace(k, WS)).toEqual(before); // a preview saves nothing
    const commit = await call(importFleet, { workspace: WS }, { body: form('fleet.csv', csv(rows), 'commit') });
    expect(commit.status).toBe(200);
    expect(commit.body).toMatchObject({ created: 2, updated: 1 });
    const t301 = await k('trucks').where({ unitNumber: 'T3-01' }).first();
    expect(t301).toMatchObject({ engineHours: 1250, version: 2 });
    expect(await k('trucks').where({ unitNumber: 'T9-02' }).first()).toMatchObject({ fuelBurnLitresPerHour: 245.5, repowerOfferId: null, notes: 'imported' });
    expect((await snapshotWorkspace(k, WS)).trucks.length).toBe(before.trucks.length + 2);
    const audit = await k('audit_log').where({ action: 'import', entity: 'truck' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.after)).toMatchObject({ fileName: 'fleet.csv', created: ['T9-01', 'T9-02'], updated: ['T3-01'] });
  });

  it('imports a good XLSX file, including the downloaded template filled in', async () => {
    const tpl = await call(getTemplate, { workspace: WS }, { url: 'http://x/?format=xlsx' });
    expect(tpl.status).toBe(200);
    const wb = new ExcelJS.Workbook();
    await wb.xlsx.load(await tpl.response.arrayBuffer());
    const sheet = wb.getWorksheet('Fleet')!;
    expect((sheet.getRow(1).values as unknown[]).slice(1)).toEqual(HEADER);
    for (const u of ['T8-01', 'T8-02']) sheet.addRow(HEADER.map((h) => (h === 'fuel_burn_l_per_h' ? null : row(u)[h])));
    const bytes = new Uint8Array(await wb.xlsx.writeBuffer());
    const r = await call(importFleet, { workspace: WS }, { body: form('filled.xlsx', bytes, 'commit') });
    expect(r.status).toBe(200);
    expect(r.body).toMatchObject({ created: 2, updated: 0 });
    expect(await k('trucks').whereIn('unitNumber', ['T8-01', 'T8-02']).pluck('annualHours')).toEqual([6100, 6100]);
    const csvTpl = await call(getTemplate, { workspace: WS }, { url: 'http://x/?format=csv' });
    expect(csvTpl.body.trim()).toBe(HEADER.join(','));
  });

  it('refuses the import to viewers and approvers (403), saving nothing', async () => {
    const before = await snapshotWorkspace(k, WS);
    for (const role of ['viewer', 'approver']) {
      signInAs(ids[`${role}@aldervane.test`]);
      expect((await call(importFleet, { workspace: WS }, { body: form('fleet.csv', csv([row('T9-50')]), 'commit') })).status).toBe(403);
    }
    signInAs(ids['analyst@aldervane.test']);
    expect(await snapshotWorkspace(k, WS)).toEqual(before);
  });
});
