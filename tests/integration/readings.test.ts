import { afterAll, beforeAll, describe, expect, inject, it, vi } from 'vitest';
import ExcelJS from 'exceljs';
import Papa from 'papaparse';
import type { Knex } from 'knex';
import { useDbForTests } from '@/lib/db';
import { GET as listReadings, POST as createReading } from '@/app/api/workspaces/[workspace]/readings/route';
import { DELETE as deleteReading, PUT as updateReading } from '@/app/api/workspaces/[workspace]/readings/[id]/route';
import { POST as importReadings } from '@/app/api/workspaces/[workspace]/readings/import/route';
import { GET as getDerived } from '@/app/api/workspaces/[workspace]/readings/derived/route';
import { POST as acceptFigures } from '@/app/api/workspaces/[workspace]/readings/trucks/[truck]/accept/route';
import { READING_COLUMNS } from '@/lib/readings/import-plan';
import { monthMinus } from '@/lib/readings/derive';
import { createTestDb } from '../support/test-db';
import { call } from './support/call';
import { signInAs } from './support/session';
import { OTHER, userIds, WS } from './support/fleet-fixtures';

vi.mock('@/lib/auth/session', async () => (await import('./support/session')).sessionMock);

const HEADER = READING_COLUMNS.map((c) => c.name);
type R = Record<string, string | number>;
const csv = (rows: R[]) => Papa.unparse([HEADER, ...rows.map((r) => HEADER.map((h) => String(r[h] ?? '')))]);
const form = (name: string, content: string | Uint8Array, mode = 'preview', duplicates = 'refuse') => {
  const f = new FormData();
  f.set('file', new File([content as BlobPart], name));
  f.set('mode', mode);
  f.set('duplicates', duplicates);
  return f;
};
const months = (from: string, n: number) => Array.from({ length: n }, (_, i) => monthMinus(from, -i));
/** 24 trucks R-01…R-24 × 24 months from 2024-01: 500 h and 100,000 L a month (200 L/h), the meter from 10,000 h. */
const goodRows = (): R[] =>
  Array.from({ length: 24 }, (_, t) => `R-${String(t + 1).padStart(2, '0')}`).flatMap((unit) =>
    months('2024-01', 24).map((month, i) => ({ unit_number: unit, month, hour_meter_h: 10_000 + 500 * (i + 1), fuel_l: 100_000, tonnes_t: 400_000 })),
  );

describe.each([
  { name: 'SQLite', pg: false },
  { name: 'PostgreSQL', pg: true },
])('readings on $name', ({ pg }) => {
  let k: Knex;
  let destroy: () => Promise<void>;
  let ids: Record<string, number>;
  let wsId: number;
  let engineId: number;
  let otherEngineId: number;
  const truck: Record<string, number> = {};

  const counts = async () => ({
    readings: Number((await k('truck_readings').count({ n: '*' }))[0].n),
    audit: Number((await k('audit_log').count({ n: '*' }))[0].n),
  });

  beforeAll(async () => {
    ({ k, destroy } = await createTestDb({ pgUrl: pg ? inject('pgUrl') : undefined }));
    useDbForTests(k);
    ids = await userIds(k);
    wsId = (await k('workspaces').where({ slug: WS }).first('id')).id;
    [engineId, otherEngineId] = (await k('engine_types').where({ workspaceId: wsId }).orderBy('id').limit(2).select('id')).map((e) => e.id);
    const now = new Date().toISOString();
    for (let t = 1; t <= 25; t++) {
      const unitNumber = `R-${String(t).padStart(2, '0')}`;
      const [row] = await k('trucks').insert({
        workspaceId: wsId, unitNumber, payloadClass: '300 t', engineTypeId: engineId, engineHours: 9000, remainingLifeHours: 40000, annualHours: 5000,
        loadFactor: 0.5, tonnesPerHour: 800, fuelBurnLitresPerHour: null, notes: '', version: 1, createdAt: now, updatedAt: now,
      }).returning('id');
      truck[unitNumber] = typeof row === 'object' ? row.id : row;
    }
    signInAs(ids['analyst@aldervane.test']);
  });
  afterAll(async () => destroy());

  it('a file with each kind of bad row reports every problem with row and column, and saves nothing', async () => {
    const rows: R[] = [
      { unit_number: 'R-25', month: '2024-01', hour_meter_h: 1000, fuel_l: 1 }, // row 2: fine
      { unit_number: 'R-25', month: '2024-02', hour_meter_h: 900, fuel_l: 1 }, // row 3: lower than the month before
      { unit_number: 'R-25', month: '2099-01', hour_meter_h: 5000, fuel_l: 1 }, // row 4: in the future
      { unit_number: 'NO-SUCH', month: '2024-01', hour_meter_h: 1000, fuel_l: 1 }, // row 5: unknown unit
      { unit_number: 'R-25', month: '2024-01', hour_meter_h: 1000, fuel_l: 1 }, // row 6: duplicate month
      { unit_number: 'R-25', month: '2024-03', hour_meter_h: 2000, fuel_l: 'much' }, // row 7: not a number
    ];
    const before = await counts();
    const preview = await call(importReadings, { workspace: WS }, { body: form('readings.csv', csv(rows)) });
    expect(preview.status).toBe(200);
    expect(preview.body.ok).toBe(false);
    const commit = await call(importReadings, { workspace: WS }, { body: form('readings.csv', csv(rows), 'commit') });
    expect(commit.status).toBe(422);
    expect(commit.body.error).toMatch(/Nothing was imported: 5 problem/);
    expect(commit.body.problems.map((p: { path: string }) => p.path)).toEqual([
      'row 3, hour_meter_h', 'row 4, month', 'row 5, unit_number', 'row 6, month', 'row 7, fuel_l',
    ]);
    expect(preview.body.rowProblems.map((p: { row: number; column: string }) => `row ${p.row}, ${p.column}`)).toEqual(commit.body.problems.map((p: { path: string }) => p.path));
    expect(await counts()).toEqual(before);
  });

  it('refuses a file that is not CSV or XLSX with the fleet import\'s message', async () => {
    const before = await counts();
    const r = await call(importReadings, { workspace: WS }, { body: form('readings.csv', '%PDF-1.7\n\u0000binary', 'commit') });
    expect(r.status).toBe(422);
    expect(r.body.problems[0]).toEqual({ path: 'file', message: expect.stringMatching(/is not a CSV or XLSX file/) });
    expect(await counts()).toEqual(before);
  });

  it('imports 24 trucks × 24 months; the same file again is refused as duplicates, or replaces them, never doubles', async () => {
    const file = csv(goodRows());
    const before = await counts();
    const ok = await call(importReadings, { workspace: WS }, { body: form('readings.csv', file, 'commit') });
    expect(ok.status).toBe(200);
    expect(ok.body).toMatchObject({ ok: true, created: 576, replaced: 0 });
    expect(await counts()).toEqual({ readings: before.readings + 576, audit: before.audit + 1 });

    const again = await call(importReadings, { workspace: WS }, { body: form('readings.csv', file, 'commit') });
    expect(again.status).toBe(422);
    expect(again.body.problems).toHaveLength(576);
    expect(again.body.problems[0]).toEqual({ path: 'row 2, month', message: expect.stringMatching(/duplicate month: a reading of R-01 for 2024-01 is already saved/) });
    expect(await counts()).toEqual({ readings: before.readings + 576, audit: before.audit + 1 });

    const replaced = await call(importReadings, { workspace: WS }, { body: form('readings.csv', file, 'commit', 'replace') });
    expect(replaced.status).toBe(200);
    expect(replaced.body).toMatchObject({ created: 0, replaced: 576 });
    expect(await counts()).toEqual({ readings: before.readings + 576, audit: before.audit + 2 });
    expect(await k('truck_readings').where({ truckId: truck['R-01'], month: '2024-01' }).first('version')).toEqual({ version: 2 });
    const audit = await k('audit_log').where({ entity: 'truck_reading', action: 'import' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.after)).toMatchObject({ fileName: 'readings.csv', replaced: expect.arrayContaining(['R-01 2024-01']) });
  });

  it('derives the figures over the chosen window and writes them only when accepted, with the version, audited', async () => {
    const d = await call(getDerived, { workspace: WS }, { url: 'http://127.0.0.1/api/x?window=6' });
    expect(d.status).toBe(200);
    const item = d.body.items.find((i: { truck: { unitNumber: string } }) => i.truck.unitNumber === 'R-01');
    // 6 months × 500 h = 3,000 h → 6,000 h a year; 600,000 L / 3,000 h = 200 L/h; the meter since new 22,000 h
    expect(item.derived).toMatchObject({ asOf: '2025-12', window: { from: '2025-07', to: '2025-12', months: 6 }, annualHours: 6000, fuelBurnLitresPerHour: 200 });
    expect(item.offer).toMatchObject({ engineHours: 22_000, annualHours: 6000, fuelBurnLitresPerHour: 200 });
    // nothing changed on the truck by looking
    expect(await k('trucks').where({ id: truck['R-01'] }).first('annualHours', 'version')).toEqual({ annualHours: 5000, version: 1 });

    const badWindow = await call(getDerived, { workspace: WS }, { url: 'http://127.0.0.1/api/x?window=61' });
    expect(badWindow.status).toBe(422);
    expect(badWindow.body.problems).toEqual([{ path: 'window', message: 'must be at most 60 months' }]);
    const stale = await call(acceptFigures, { workspace: WS, truck: String(truck['R-01']) }, { body: { version: 7, windowMonths: 6, fields: ['annualHours'] } });
    expect(stale.status).toBe(409);
    const ok = await call(acceptFigures, { workspace: WS, truck: String(truck['R-01']) }, { body: { version: 1, windowMonths: 6, fields: ['annualHours', 'fuelBurnLitresPerHour', 'engineHours'] } });
    expect(ok.status).toBe(200);
    const t = await k('trucks').where({ id: truck['R-01'] }).first('annualHours', 'fuelBurnLitresPerHour', 'engineHours', 'version');
    expect(t).toEqual({ annualHours: 6000, fuelBurnLitresPerHour: 200, engineHours: 22_000, version: 2 });
    const audit = await k('audit_log').where({ entity: 'truck', entityId: String(truck['R-01']), action: 'update' }).orderBy('id', 'desc').first();
    expect(JSON.parse(audit.before)).toEqual({ annualHours: 5000, fuelBurnLitresPerHour: null, engineHours: 9000 });
    expect(JSON.parse(audit.after)).toMatchObject({ annualHours: 6000, source: 'readings', asOf: '2025-12', window: { months: 6 } });
    const none = await call(acceptFigures, { workspace: WS, truck: String(truck['R-25']) }, { body: { version: 1, windowMonths: 6, fields: ['annualHours'] } });
    expect(none.status).toBe(422);
  });

  it('typed readings: create, duplicate month and a falling meter refused, stale version 409, delete; a repower offers the engine type', async () => {
    const base = { truckId: truck['R-25'], month: '2024-01', hourMeter: 1000, fuelLitres: 20_000 };
    const before = await counts();
    const created = await call(createReading, { workspace: WS }, { body: base });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ unitNumber: 'R-25', month: '2024-01', hourMeter: 1000, version: 1 });
    expect(await counts()).toEqual({ readings: before.readings + 1, audit: before.audit + 1 });
    expect((await call(createReading, { workspace: WS }, { body: base })).body.problems).toEqual([{ path: 'month', message: expect.stringMatching(/duplicate month/) }]);
    expect((await call(createReading, { workspace: WS }, { body: { ...base, month: '2024-02', hourMeter: 999 } })).body.problems).toEqual([
      { path: 'hourMeter', message: expect.stringMatching(/lower than the reading of 2024-01/) },
    ]);
    expect((await call(createReading, { workspace: WS }, { body: { ...base, month: '2099-02' } })).body.problems).toEqual([{ path: 'month', message: expect.stringMatching(/in the future/) }]);
    expect((await call(createReading, { workspace: WS }, { body: { ...base, month: '2024-03', fuelLitres: 2e9 } })).body.problems).toEqual([
      { path: 'fuelLitres', message: 'must be at most 1,000,000 litres' },
    ]);
    const id = String(created.body.id);
    expect((await call(updateReading, { workspace: WS, id }, { method: 'PUT', body: { ...base, fuelLitres: 21_000, version: 5 } })).status).toBe(409);
    const updated = await call(updateReading, { workspace: WS, id }, { method: 'PUT', body: { ...base, fuelLitres: 21_000, version: 1 } });
    expect(updated.body).toMatchObject({ fuelLitres: 21_000, version: 2 });

    const repower = await call(createReading, { workspace: WS }, {
      body: { ...base, month: '2024-02', hourMeter: 120, fuelLitres: 30_000, repowerDate: '2024-02-09', repowerCost: 1_650_000, repowerEngineTypeId: otherEngineId },
    });
    expect(repower.status).toBe(201);
    const d = await call(getDerived, { workspace: WS }, { url: 'http://127.0.0.1/api/x?window=12' });
    const item = d.body.items.find((i: { truck: { unitNumber: string } }) => i.truck.unitNumber === 'R-25');
    expect(item.offer).toMatchObject({ engineTypeId: otherEngineId, engineHours: 120 });
    expect(item.derived.engineHours).toEqual({ value: 120, basis: 'since-repower', since: '2024-02' });
    const ok = await call(acceptFigures, { workspace: WS, truck: String(truck['R-25']) }, { body: { version: 1, windowMonths: 12, fields: ['engineTypeId'] } });
    expect(ok.status).toBe(200);
    expect(await k('trucks').where({ id: truck['R-25'] }).first('engineTypeId', 'engineHours')).toEqual({ engineTypeId: otherEngineId, engineHours: 9000 });

    expect((await call(deleteReading, { workspace: WS, id: String(repower.body.id) }, { method: 'DELETE', url: 'http://127.0.0.1/api/x?version=1' })).status).toBe(200);
    const list = await call(listReadings, { workspace: WS }, { url: `http://127.0.0.1/api/x?truck=${truck['R-25']}` });
    expect(list.body.items.map((r: { month: string }) => r.month)).toEqual(['2024-01']);
    const actions = (await k('audit_log').where({ entity: 'truck_reading' }).whereNot({ action: 'import' }).select('action')).map((a) => a.action);
    expect(actions).toEqual(['create', 'update', 'create', 'delete']);
  });

  it('imports an XLSX sheet whose month column holds dates', async () => {
    const wb = new ExcelJS.Workbook();
    const ws = wb.addWorksheet('Readings');
    ws.addRow(HEADER);
    ws.addRow(['R-24', new Date(Date.UTC(2026, 0, 1)), 22_600, 100_000]);
    const bytes = new Uint8Array(await wb.xlsx.writeBuffer());
    const r = await call(importReadings, { workspace: WS }, { body: form('readings.xlsx', bytes, 'commit') });
    expect(r.status).toBe(200);
    expect(await k('truck_readings').where({ truckId: truck['R-24'], month: '2026-01' }).first('hourMeter')).toEqual({ hourMeter: 22_600 });
  });

  it('the demo readings: T3-05 burns more than its register figure, T3-14 offers its repower engine, T3-02 counts from its overhaul', async () => {
    const d = await call(getDerived, { workspace: WS }, { url: 'http://127.0.0.1/api/x?window=12' });
    const of = (u: string) => d.body.items.find((i: { truck: { unitNumber: string } }) => i.truck.unitNumber === u);
    expect(of('T3-05').derived.fuelBurnLitresPerHour).toBeGreaterThan(of('T3-05').truck.fuelBurnLitresPerHour);
    const bypass = (await k('engine_types').where({ workspaceId: wsId, key: 'km-2700-bypass' }).first('id')).id;
    expect(of('T3-14').offer).toMatchObject({ engineTypeId: bypass, engineKey: 'km-2700-bypass' });
    expect(of('T3-14').derived.engineHours).toMatchObject({ basis: 'since-repower', since: '2025-07' });
    expect(of('T3-02').derived.engineHours).toMatchObject({ basis: 'since-overhaul', since: '2025-01' });
    expect(of('T3-01').derived).toBeNull();
  });

  it('access by role: viewers read but do not import, type or accept; other workspaces are closed', async () => {
    signInAs(ids['viewer@aldervane.test']);
    expect((await call(getDerived, { workspace: WS })).status).toBe(200);
    expect((await call(listReadings, { workspace: WS })).status).toBe(200);
    expect((await call(importReadings, { workspace: WS }, { body: form('readings.csv', csv(goodRows()), 'commit', 'replace') })).status).toBe(403);
    expect((await call(createReading, { workspace: WS }, { body: { truckId: truck['R-25'], month: '2024-05', hourMeter: 2000, fuelLitres: 1 } })).status).toBe(403);
    signInAs(ids['approver@aldervane.test']);
    expect((await call(acceptFigures, { workspace: WS, truck: String(truck['R-02']) }, { body: { version: 1, windowMonths: 6, fields: ['annualHours'] } })).status).toBe(403);
    expect((await call(listReadings, { workspace: OTHER })).status).toBe(403);
    signInAs(ids['analyst@aldervane.test']);
    // the analyst also serves the other site, whose trucks are not this workspace's
    const r = await call(createReading, { workspace: OTHER }, { body: { truckId: truck['R-02'], month: '2024-05', hourMeter: 2000, fuelLitres: 1 } });
    expect(r.status).toBe(422);
    expect(r.body.problems[0].path).toBe('truckId');
  });
});
