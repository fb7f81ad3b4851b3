/**
 * The readings import (issue 20): one sheet row per truck and month, checked
 * with the fleet import's readers and error shape (lib/import). Every problem
 * is listed with its row and column and nothing is written unless the whole
 * file is clean. Pure: the caller passes the workspace's trucks, engine types,
 * the readings already saved and today's date.
 */
import type { Cell, Table } from '@/lib/import/read-table';
import type { NumberFormat } from '@/lib/number-input';
import { addSchemaIssues, checkHeader, lookupKey, readNumber, readText, rowProblems, type RowProblem } from '@/lib/import/validate-fleet';
import { readingFieldsSchema, readingProblems, type ReadingFields } from '@/lib/validation/readings';
import { meterProblem } from './derive';

export const READING_COLUMNS = [
  { name: 'unit_number', field: 'unitNumber', kind: 'text', required: true, help: 'Unit number of a truck in the register' },
  { name: 'month', field: 'month', kind: 'month', required: true, help: 'Month of the reading, YYYY-MM (not in the future); one row per truck and month' },
  { name: 'hour_meter_h', field: 'hourMeter', kind: 'number', required: true, help: "Engine hour meter at the month's end (h); never lower than the month before, except in a repower month" },
  { name: 'fuel_l', field: 'fuelLitres', kind: 'number', required: true, help: 'Fuel dispensed in the month (L)' },
  { name: 'tonnes_t', field: 'tonnes', kind: 'number', required: false, help: 'Tonnes hauled in the month (t); empty if not known' },
  { name: 'overhauls', field: 'overhauls', kind: 'number', required: false, help: 'Engine overhauls done in the month (0 if empty)' },
  { name: 'failures', field: 'failures', kind: 'number', required: false, help: 'In-service engine failures in the month (0 if empty)' },
  { name: 'days_down', field: 'daysDown', kind: 'number', required: false, help: 'Days out of service in the month for those events (0 if empty)' },
  { name: 'repower_date', field: 'repowerDate', kind: 'date', required: false, help: 'Date of a repower done in the month, YYYY-MM-DD; empty if none' },
  { name: 'repower_cost', field: 'repowerCost', kind: 'number', required: false, help: 'What the repower cost; only with a repower date' },
  { name: 'repower_engine_type', field: 'repowerEngineTypeId', kind: 'ref', required: false, help: 'Key of the engine type fitted by the repower (from the engine library)' },
  { name: 'notes', field: 'notes', kind: 'text', required: false, help: 'Free text (must not start with =, +, - or @)' },
] as const;

const FIELD_TO_COLUMN: Record<string, string> = Object.fromEntries(READING_COLUMNS.map((c) => [c.field, c.name]));
const DEFAULT_ZERO = new Set(['overhauls', 'failures', 'daysDown']);

export type Duplicates = 'refuse' | 'replace';
export type SavedReading = { id: number; truckId: number; month: string; hourMeter: number; repowerDate: string | null };
export type ReadingLookups = {
  /** Trucks by unit number. */
  trucks: Map<string, number>;
  /** Engine types by key. */
  engines: Map<string, number>;
  /** Readings already saved in the workspace. */
  saved: SavedReading[];
};
export type PlannedReading = { row: number; unitNumber: string; truckId: number; action: 'create' | 'replace'; replaces?: number; input: ReadingFields };
export type ReadingImportPlan = { problems: RowProblem[]; rows: PlannedReading[]; creates: number; replaces: number };

/** A month or date cell: text as typed, or a spreadsheet date (read as an ISO time in UTC), cut to `length` characters. */
function readDateLike(c: Cell, length: 7 | 10): { value: string | null } | { error: string } {
  if (typeof c === 'number') return { error: `${c} is not a ${length === 7 ? 'month (YYYY-MM)' : 'date (YYYY-MM-DD)'}; format the cell as text or as a date` };
  const t = readText(c);
  if ('error' in t) return t;
  const s = t.value.trim();
  if (s === '') return { value: null };
  if (/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d+)?Z$/.test(s)) return { value: s.slice(0, length) };
  if (length === 7 && /^\d{4}-\d{2}-01$/.test(s)) return { value: s.slice(0, 7) };
  return { value: s };
}

/** `format`: how the workspace types numbers (lib/number-input.ts), as the fleet import reads them. */
export function planReadingsImport(table: Table, lookups: ReadingLookups, duplicates: Duplicates, today: Date, format: NumberFormat = 'point'): ReadingImportPlan {
  const problems = checkHeader(table.header, READING_COLUMNS);
  const empty = { rows: [], creates: 0, replaces: 0 };
  if (problems.length) return { problems, ...empty };
  if (table.rows.length === 0) return { problems: [{ row: 2, column: '(file)', message: 'The file has a header but no data rows.' }], ...empty };

  const index = new Map(table.header.map((h, i) => [h.toLowerCase(), i]));
  const savedByKey = new Map(lookups.saved.map((s) => [`${s.truckId}|${s.month}`, s]));
  const firstRow = new Map<string, number>();
  const rows: PlannedReading[] = [];

  for (const { row, cells } of table.rows) {
    const raw: Record<string, unknown> = {};
    const rp = rowProblems(problems, row);
    const { bad, add } = rp;
    let truckId: number | undefined;
    let unitNumber = '';
    for (const col of READING_COLUMNS) {
      const cell = cells[index.get(col.name)!] ?? null;
      if (col.kind === 'number') {
        const r = readNumber(cell, format);
        if ('error' in r) add(col.name, r.error);
        else if (r.value === null && col.required) add(col.name, 'is required');
        else raw[col.field] = r.value === null && DEFAULT_ZERO.has(col.field) ? 0 : r.value;
      } else if (col.kind === 'month' || col.kind === 'date') {
        const r = readDateLike(cell, col.kind === 'month' ? 7 : 10);
        if ('error' in r) add(col.name, r.error);
        else if (r.value === null && col.required) add(col.name, 'is required');
        else raw[col.field] = r.value;
      } else {
        const r = readText(cell);
        if ('error' in r) {
          add(col.name, r.error);
          continue;
        }
        const v = r.value.trim();
        if (col.field === 'notes') raw.notes = v;
        else if (col.field === 'unitNumber') {
          if (v === '') add(col.name, 'is required');
          else {
            unitNumber = v;
            truckId = lookups.trucks.get(v);
            if (truckId === undefined) add(col.name, `no truck in the register has the unit number "${v.slice(0, 80)}"`);
          }
        } else if (v === '') raw[col.field] = null;
        else {
          const found = lookupKey(lookups.engines, v, 'engine type');
          if ('error' in found) add(col.name, found.error);
          else raw[col.field] = found.id;
        }
      }
    }
    const parsed = readingFieldsSchema.safeParse(raw);
    if (!parsed.success) {
      addSchemaIssues(parsed.error.issues, FIELD_TO_COLUMN, rp);
      continue;
    }
    for (const p of readingProblems(parsed.data, today)) if (!bad.has(FIELD_TO_COLUMN[p.field])) add(FIELD_TO_COLUMN[p.field], p.message);
    if (bad.size || truckId === undefined) continue;
    const key = `${truckId}|${parsed.data.month}`;
    const first = firstRow.get(key);
    if (first !== undefined) {
      add('month', `duplicate month: ${unitNumber} ${parsed.data.month} is already on row ${first}`);
      continue;
    }
    firstRow.set(key, row);
    const saved = savedByKey.get(key);
    if (saved && duplicates === 'refuse') {
      add('month', `duplicate month: a reading of ${unitNumber} for ${parsed.data.month} is already saved (import again choosing "replace" to overwrite it)`);
      continue;
    }
    rows.push({ row, unitNumber, truckId, action: saved ? 'replace' : 'create', replaces: saved?.id, input: parsed.data });
  }

  // The meter, month by month per truck, over what would be saved: saved readings not replaced, plus the file's clean rows.
  {
    type Entry = { month: string; hourMeter: number; repowerDate: string | null; row?: number };
    const byTruck = new Map<number, Map<string, Entry>>();
    const of = (t: number) => byTruck.get(t) ?? byTruck.set(t, new Map()).get(t)!;
    for (const s of lookups.saved) of(s.truckId).set(s.month, s);
    for (const r of rows) of(r.truckId).set(r.input.month, { ...r.input, row: r.row });
    const touched = new Set(rows.map((r) => r.truckId));
    for (const t of touched) {
      const list = [...of(t).values()].sort((a, b) => (a.month < b.month ? -1 : 1));
      for (let i = 1; i < list.length; i++) {
        const prev = list[i - 1];
        const cur = list[i];
        if (prev.row === undefined && cur.row === undefined) continue;
        const message = meterProblem(prev, cur);
        if (!message) continue;
        if (cur.row !== undefined) problems.push({ row: cur.row, column: 'hour_meter_h', message });
        else problems.push({ row: prev.row!, column: 'hour_meter_h', message: `${prev.hourMeter.toLocaleString('en-US')} h is higher than the saved reading of ${cur.month} (${cur.hourMeter.toLocaleString('en-US')} h)` });
      }
    }
    problems.sort((a, b) => a.row - b.row);
  }
  const creates = rows.filter((r) => r.action === 'create').length;
  return { problems, rows, creates, replaces: rows.length - creates };
}
