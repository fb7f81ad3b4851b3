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

/** One sheet row's problems: `add` records one against a column, `bad` holds the columns that have one (later checks skip them). */
export function rowProblems(problems: RowProblem[], row: number): { bad: Set<string>; add: (column: string, message: string) => void } {
  const bad = new Set<string>();
  return {
    bad,
    add: (column, message) => {
      problems.push({ row, column, message });
      bad.add(column);
    },
  };
}

/** A key looked up among the workspace's keys, with the first known keys in the message when it is not one of them. */
export function lookupKey(map: ReadonlyMap<string, number>, key: string, what: string): { id: number } | { error: string } {
  const id = map.get(key);
  if (id !== undefined) return { id };
  return { error: `no ${what} has the key "${key.slice(0, 80)}"${map.size ? ` (known: ${[...map.keys()].slice(0, 10).join(', ')})` : ''}` };
}

/** A row's schema issues, each against the column of its field, except on columns that already have a problem. */
export function addSchemaIssues(issues: ReadonlyArray<{ path: PropertyKey[]; message: string }>, fieldToColumn: Record<string, string>, rp: ReturnType<typeof rowProblems>): void {
  for (const issue of issues) {
    const column = fieldToColumn[String(issue.path[0])] ?? String(issue.path[0]);
    if (!rp.bad.has(column)) rp.add(column, issue.message);
  }
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
    const rp = rowProblems(problems, row);
    const { bad, add } = rp;
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
          const found = col.field === 'engineTypeId' ? lookupKey(lookups.engines, v, 'engine type') : lookupKey(lookups.offers, v, 'repower offer');
          if ('error' in found) add(col.name, found.error);
          else raw[col.field] = found.id;
        }
      }
    }
    const parsed = truckInputSchema.safeParse(raw);
    if (!parsed.success) {
      addSchemaIssues(parsed.error.issues, FIELD_TO_COLUMN, rp);
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
