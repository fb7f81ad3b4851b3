import { parseNumberText, type NumberFormat } from '@/lib/number-input';
import { truckInputSchema, type TruckInput } from '@/lib/validation/fleet';
import { FIELD_TO_COLUMN, FLEET_COLUMNS, type ImportColumn } from './columns';
import type { Cell, Table } from './read-table';

export type RowProblem = { row: number; column: string; message: string };
export type PlannedRow = { row: number; unitNumber: string; action: 'create' | 'update'; truckId?: number; input: TruckInput };
export type FleetImportPlan = { problems: RowProblem[]; rows: PlannedRow[]; creates: number; updates: number };

export type ImportLookups = {
  engines: Map<string, number>;
  offers: Map<string, number>;
  /** Existing trucks by unit number. */
  trucks: Map<string, number>;
};

/**
 * A number cell (blank = null): a spreadsheet number as it is, text by the one rule of forms and imports
 * (lib/number-input.ts) in the workspace's format; also used by the readings import.
 */
export function readNumber(c: Cell, format: NumberFormat = 'point'): { value: number | null } | { error: string } {
  if (c === null) return { value: null };
  if (typeof c === 'number') return Number.isFinite(c) ? { value: c } : { error: 'is not a finite number' };
  if (typeof c === 'object') return { error: `is a formula (=${c.formula}); enter the value instead` };
  const s = c.trim();
  if (s === '') return { value: null };
  const r = parseNumberText(s, format);
  return r.ok ? { value: r.value } : { error: `"${s.slice(0, 40)}" is not a number: ${r.message}` };
}

/** A text cell (blank = ""); also used by the readings import. */
export function readText(c: Cell): { value: string } | { error: string } {
  if (c === null) return { value: '' };
  if (typeof c === 'number') return { value: String(c) };
  if (typeof c === 'object') return { error: `is a formula (=${c.formula}); formulas are refused in text columns` };
  return { value: c };
}

/** Header problems: every template column must be there once, and nothing else (`columns`: the fleet sheet's unless given). */
export function checkHeader(header: string[], columns: ReadonlyArray<Pick<ImportColumn, 'name'>> = FLEET_COLUMNS): RowProblem[] {
  const problems: RowProblem[] = [];
  const known = new Set(columns.map((c) => c.name));
  const seen = new Set<string>();
  header.forEach((h, i) => {
    const name = h.toLowerCase();
    if (name === '') return;
    if (!known.has(name)) problems.push({ row: 1, column: h, message: `unknown column (column ${i + 1}); the template's columns are ${[...known].join(', ')}` });
    else if (seen.has(name)) problems.push({ row: 1, column: h, message: 'appears twice' });
    seen.add(name);
  });
  for (const c of columns) if (!seen.has(c.name)) problems.push({ row: 1, column: c.name, message: 'column is missing' });
  return problems;
}

/**
 * Checks every row against the truck schema and the workspace's engine and
 * offer keys, and plans a create or an update per unit number. Every problem
 * is listed (row, column, reason); nothing is written here.
 */
export function planFleetImport(table: Table, lookups: ImportLookups, format: NumberFormat = 'point'): FleetImportPlan {
  const problems = checkHeader(table.header);
  if (problems.length) return { problems, rows: [], creates: 0, updates: 0 };
  if (table.rows.length === 0) return { problems: [{ row: 2, column: '(file)', message: 'The file has a header but no data rows.' }], rows: [], creates: 0, updates: 0 };

  const index = new Map(table.header.map((h, i) => [h.toLowerCase(), i]));
  const firstRowOfUnit = new Map<string, number>();
  const rows: PlannedRow[] = [];

  for (const { row, cells } of table.rows) {
    const raw: Record<string, unknown> = {};
    const bad = new Set<string>();
    const add = (column: string, message: string) => {
      problems.push({ row, column, message });
      bad.add(column);
    };
    for (const col of FLEET_COLUMNS) {
      const cell = cells[index.get(col.name)!] ?? null;
      if (col.kind === 'number') {
        const r = readNumber(cell, format);
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
        if (col.kind === 'text') raw[col.field] = v;
        else if (v === '') {
          if (col.required) add(col.name, 'is required');
          else raw[col.field] = null;
        } else {
          const map = col.field === 'engineTypeId' ? lookups.engines : lookups.offers;
          const id = map.get(v);
          const what = col.field === 'engineTypeId' ? 'engine type' : 'repower offer';
          if (id === undefined) add(col.name, `no ${what} has the key "${v.slice(0, 80)}"${map.size ? ` (known: ${[...map.keys()].slice(0, 10).join(', ')})` : ''}`);
          else raw[col.field] = id;
        }
      }
    }
    const parsed = truckInputSchema.safeParse(raw);
    if (!parsed.success) {
      for (const issue of parsed.error.issues) {
        const column = FIELD_TO_COLUMN[String(issue.path[0])] ?? String(issue.path[0]);
        if (!bad.has(column)) add(column, issue.message);
      }
      continue;
    }
    if (bad.size) continue;
    const unit = parsed.data.unitNumber;
    const first = firstRowOfUnit.get(unit);
    if (first !== undefined) {
      add('unit_number', `"${unit}" is already on row ${first}`);
      continue;
    }
    firstRowOfUnit.set(unit, row);
    const truckId = lookups.trucks.get(unit);
    rows.push({ row, unitNumber: unit, action: truckId === undefined ? 'create' : 'update', truckId, input: parsed.data });
  }
  const creates = rows.filter((r) => r.action === 'create').length;
  return { problems, rows, creates, updates: rows.length - creates };
}
