import type { RawCell } from './cells';
import { SheetInterpreter, SheetRejected, type InterpretOptions } from './sheet-interpreter';

const base: InterpretOptions = { timeZone: 'Europe/Berlin', country: 'DE', intervalConvention: 'interval_end' };

function interpret(rows: RawCell[][], options: Partial<InterpretOptions> = {}) {
  const interpreter = new SheetInterpreter({ ...base, ...options });
  rows.forEach((cells, i) => interpreter.push(i + 1, cells));
  return interpreter.finish();
}

const wall = (d: number, h: number, m: number): Date => new Date(Date.UTC(2026, 9, d, h, m));

describe('SheetInterpreter', () => {
  it('skips title lines, folds a units row into the names and finds timestamp and status columns', () => {
    const sheet = interpret([
      ['Plant logger export'],
      [],
      ['Time', 'NOx', 'O2', 'Status'],
      ['local', 'mg/Nm3', '%', ''],
      [wall(1, 10, 1), 61.5, 3.2, 'OK'],
      [wall(1, 10, 2), 62.5, 3.3, 'CAL'],
    ]);
    expect(sheet.headerRowNumber).toBe(3);
    expect(sheet.timestampColumn).toBe(0);
    expect(sheet.statusColumn).toBe(3);
    expect(sheet.columns.map((c) => [c.header, c.hints.parameter, c.hints.unit])).toEqual([
      ['NOx [mg/Nm3]', 'NOx', 'mg/Nm3'],
      ['O2 [%]', 'O2', '%'],
    ]);
    expect(sheet.statuses).toEqual(['valid', 'calibration']);
    expect(sheet.intervalSeconds).toBe(60);
    // 10:01 local summer time ends the minute that starts 08:00 UTC.
    expect(Array.from(sheet.tUtcMs)).toEqual([Date.UTC(2026, 9, 1, 8, 0), Date.UTC(2026, 9, 1, 8, 1)]);
  });

  it('stores interval-start labels as they are', () => {
    const sheet = interpret([['Time', 'NOx'], [wall(1, 10, 0), 1], [wall(1, 10, 1), 2]], { intervalConvention: 'interval_start' });
    expect(Array.from(sheet.tUtcMs)).toEqual([Date.UTC(2026, 9, 1, 8, 0), Date.UTC(2026, 9, 1, 8, 1)]);
  });

  it('reads Excel serial numbers under a timestamp header', () => {
    // 46296 is 2026-10-01 in the 1900 date system (ECMA-376 Part 1 §18.17.4.1 base 1899-12-30).
    const sheet = interpret([['Timestamp', 'NOx'], [46296 + 601 / 1440, 1], [46296 + 602 / 1440, 2]]);
    expect(Array.from(sheet.tUtcMs)).toEqual([Date.UTC(2026, 9, 1, 8, 0), Date.UTC(2026, 9, 1, 8, 1)]);
  });

  it('reports blank, text, error and date cells per cell and keeps the rest of the row', () => {
    const sheet = interpret([
      ['Time', 'NOx', 'O2'],
      ['01.10.2026 10:01', '', '3,2'],
      ['01.10.2026 10:02', 'Err', { error: '#N/A' }],
      ['01.10.2026 10:03', new Date(0), 3],
    ]);
    expect(sheet.problems.map((p) => [p.row, p.columnIndex, p.code])).toEqual([
      [2, 1, 'blank'],
      [3, 1, 'text'],
      [3, 2, 'error_cell'],
      [4, 1, 'date_in_value'],
    ]);
    expect(Array.from(sheet.values[1]!)).toEqual([3.2, NaN, 3]);
    expect(sheet.tUtcMs.every((t) => Number.isFinite(t))).toBe(true);
  });

  it('does not report a blank cell in a row the logger marked as not valid', () => {
    const sheet = interpret([['Time', 'NOx', 'Status'], ['01.10.2026 10:01', '', 'fault'], ['01.10.2026 10:02', 5, 'OK']]);
    expect(sheet.problems).toEqual([]);
    expect(sheet.statuses).toEqual(['fault', 'valid']);
  });

  it('rejects a row with an unknown status word', () => {
    const sheet = interpret([['Time', 'NOx', 'Status'], ['01.10.2026 10:01', 5, 'purge?'], ['01.10.2026 10:02', 5, 'OK']]);
    expect(sheet.problems).toEqual([expect.objectContaining({ row: 2, columnIndex: 2, code: 'unknown_status' })]);
    expect(Number.isNaN(sheet.tUtcMs[0]!)).toBe(true);
  });

  it('places the repeated autumn hour by its order when the file shows it twice', () => {
    const rows: RawCell[][] = [['Time', 'NOx']];
    for (const minute of [0, 30, 59]) rows.push([wall(25, 2, minute), 1]);
    for (const minute of [0, 30, 59]) rows.push([wall(25, 2, minute), 2]);
    const sheet = interpret(rows, { intervalConvention: 'interval_start' });
    expect(sheet.problems).toEqual([]);
    expect(Array.from(sheet.tUtcMs).map((t) => new Date(t).toISOString().slice(11, 16))).toEqual(['00:00', '00:30', '00:59', '01:00', '01:30', '01:59']);
    expect(sheet.notes[0]).toMatch(/6 rows in the repeated hour/);
  });

  it('reports an autumn time shown once, and a spring time that does not exist', () => {
    const sheet = interpret([['Time', 'NOx'], [wall(25, 2, 30), 1], [new Date(Date.UTC(2026, 2, 29, 2, 30)), 2], [wall(25, 4, 0), 3]]);
    expect(sheet.problems.map((p) => [p.row, p.code])).toEqual([
      [2, 'ambiguous_local_time'],
      [3, 'missing_local_time'],
    ]);
  });

  it('settles day/month order for a whole text column', () => {
    const sheet = interpret([['Time', 'NOx'], ['10/01/2026 10:00', 1], ['10/13/2026 10:00', 2]], { intervalConvention: 'interval_start' });
    expect(sheet.dayMonth).toEqual({ order: 'month_first', settledBy: 'data' });
    expect(new Date(sheet.tUtcMs[1]!).toISOString()).toBe('2026-10-13T08:00:00.000Z');
  });

  it('imports identical duplicate rows once and differing ones not at all', () => {
    const sheet = interpret([
      ['Time', 'NOx'],
      ['01.10.2026 10:01', 1],
      ['01.10.2026 10:01', 1],
      ['01.10.2026 10:02', 2],
      ['01.10.2026 10:02', 3],
      ['01.10.2026 10:03', 4],
    ]);
    expect(sheet.duplicateRows).toBe(3);
    expect(Array.from(sheet.tUtcMs).map(Number.isFinite)).toEqual([true, false, false, false, true]);
  });

  it('rejects rows outside the declared period', () => {
    const sheet = interpret([['Time', 'NOx'], ['01.10.2026 00:01', 1], ['01.10.2026 00:02', 2], ['01.10.2026 00:03', 3]], {
      period: { fromUtcMs: Date.UTC(2026, 8, 30, 22, 0), toUtcMs: Date.UTC(2026, 8, 30, 22, 2) },
    });
    expect(sheet.problems.map((p) => [p.row, p.code])).toEqual([[4, 'outside_period']]);
  });

  it.each([
    [[[]], 'empty_sheet'],
    [[['Name', 'Value'], ['a', 1], ['b', 2]], 'no_timestamp_column'],
    [[['Time', 'Note'], ['01.10.2026 10:00', 'x']], 'no_timestamp_column'],
  ])('refuses a sheet it cannot import (%#)', (rows, code) => {
    expect(() => interpret(rows as RawCell[][])).toThrow(SheetRejected);
    try {
      interpret(rows as RawCell[][]);
    } catch (error) {
      expect((error as SheetRejected).code).toBe(code);
    }
  });
});
