import { describe, expect, it } from 'vitest';
import { planReadingsImport, READING_COLUMNS, type ReadingLookups } from '@/lib/readings/import-plan';
import type { Cell, Table } from '@/lib/import/read-table';

const HEADER = READING_COLUMNS.map((c) => c.name);
const TODAY = new Date('2026-06-15T12:00:00Z');
type R = Partial<Record<(typeof HEADER)[number], Cell>>;
const row = (over: R): Cell[] => {
  const base: R = { unit_number: 'T1', month: '2026-01', hour_meter_h: 1000, fuel_l: 20_000, tonnes_t: '', overhauls: '', failures: '', days_down: '', repower_date: '', repower_cost: '', repower_engine_type: '', notes: '' };
  const all = { ...base, ...over };
  return HEADER.map((h) => all[h] ?? null);
};
const table = (rows: Cell[][]): Table => ({ header: HEADER, rows: rows.map((cells, i) => ({ row: i + 2, cells })) });
const lookups = (saved: ReadingLookups['saved'] = []): ReadingLookups => ({ trucks: new Map([['T1', 1], ['T2', 2]]), engines: new Map([['new-eng', 9]]), saved });

describe('planReadingsImport: row validation', () => {
  it('a clean file plans one create per row, with blanks as zero or none', () => {
    const plan = planReadingsImport(table([row({}), row({ month: '2026-02', hour_meter_h: 1500, overhauls: 1, days_down: 4 })]), lookups(), 'refuse', TODAY);
    expect(plan.problems).toEqual([]);
    expect(plan.creates).toBe(2);
    expect(plan.rows[0].input).toMatchObject({ month: '2026-01', hourMeter: 1000, fuelLitres: 20_000, tonnes: null, overhauls: 0, failures: 0, daysDown: 0, repowerDate: null });
    expect(plan.rows[1].input).toMatchObject({ overhauls: 1, daysDown: 4 });
  });

  it('reads a spreadsheet date cell as its month', () => {
    const plan = planReadingsImport(table([row({ month: '2026-03-01T00:00:00.000Z' })]), lookups(), 'refuse', TODAY);
    expect(plan.rows[0].input.month).toBe('2026-03');
  });

  it('names row and column for each kind of bad row, all at once', () => {
    const plan = planReadingsImport(
      table([
        row({}), // row 2: fine
        row({ month: '2026-02', hour_meter_h: 900 }), // row 3: lower than row 2
        row({ month: '2026-07' }), // row 4: future (today is 2026-06)
        row({ unit_number: 'NOPE' }), // row 5: unknown unit
        row({ month: '2026-01', hour_meter_h: 1000 }), // row 6: duplicate of row 2
        row({ unit_number: 'T2', fuel_l: -1, hour_meter_h: 'lots' }), // row 7: two bad numbers
        row({ unit_number: 'T2', month: '2026-05', repower_cost: 1000 }), // row 8: cost without a repower
        row({ unit_number: 'T2', month: '2026-04', repower_date: '2026-05-02', repower_engine_type: 'old' }), // row 9: date outside month, unknown engine
        row({ unit_number: 'T2', month: '2026-13' }), // row 10: not a month
      ]),
      lookups(),
      'refuse',
      TODAY,
    );
    const got = plan.problems.map((p) => `${p.row} ${p.column}`);
    expect(got).toEqual([
      '3 hour_meter_h', '4 month', '5 unit_number', '6 month', '7 hour_meter_h', '7 fuel_l', '8 repower_cost', '9 repower_engine_type', '9 repower_date', '10 month',
    ]);
    const msg = (r: number, c: string) => plan.problems.find((p) => p.row === r && p.column === c)!.message;
    expect(msg(3, 'hour_meter_h')).toMatch(/900 h is lower than the reading of 2026-01 \(1,000 h\)/);
    expect(msg(4, 'month')).toMatch(/2026-07 is in the future/);
    expect(msg(5, 'unit_number')).toMatch(/no truck .* "NOPE"/);
    expect(msg(6, 'month')).toMatch(/duplicate month: T1 2026-01 is already on row 2/);
    expect(msg(7, 'fuel_l')).toMatch(/must not be negative/);
    expect(msg(9, 'repower_engine_type')).toMatch(/no engine type has the key "old"/);
    expect(msg(9, 'repower_date')).toMatch(/must be inside the month 2026-04/);
  });

  it('a repower month may show a lower meter', () => {
    const plan = planReadingsImport(table([row({}), row({ month: '2026-02', hour_meter_h: 40, repower_date: '2026-02-11', repower_cost: 1_600_000, repower_engine_type: 'new-eng' })]), lookups(), 'refuse', TODAY);
    expect(plan.problems).toEqual([]);
    expect(plan.rows[1].input).toMatchObject({ repowerEngineTypeId: 9, repowerCost: 1_600_000 });
  });

  it('a month already saved is refused, or replaced when asked; the meter is checked against saved months', () => {
    const saved = [{ id: 50, truckId: 1, month: '2026-01', hourMeter: 1000, repowerDate: null }, { id: 51, truckId: 1, month: '2026-03', hourMeter: 2000, repowerDate: null }];
    const refused = planReadingsImport(table([row({})]), lookups(saved), 'refuse', TODAY);
    expect(refused.problems).toEqual([{ row: 2, column: 'month', message: expect.stringMatching(/already saved/) }]);
    const replaced = planReadingsImport(table([row({ hour_meter_h: 1100 })]), lookups(saved), 'replace', TODAY);
    expect(replaced.problems).toEqual([]);
    expect(replaced.rows[0]).toMatchObject({ action: 'replace', replaces: 50 });
    const above = planReadingsImport(table([row({ month: '2026-02', hour_meter_h: 2500 })]), lookups(saved), 'refuse', TODAY);
    expect(above.problems).toEqual([{ row: 2, column: 'hour_meter_h', message: expect.stringMatching(/higher than the saved reading of 2026-03/) }]);
  });

  it('a wrong header is reported before any row', () => {
    const plan = planReadingsImport({ header: ['unit_number', 'month'], rows: [] }, lookups(), 'refuse', TODAY);
    expect(plan.problems.every((p) => p.row === 1 && p.message === 'column is missing')).toBe(true);
    expect(plan.problems.length).toBe(HEADER.length - 2);
  });
});
