import type { Knex } from 'knex';
import { createOwnerDb } from '../../test-support/test-app';
import { copyOutBinary, packStagedColumn, packStagedRows, unpackStagedColumn, unpackStagedRows } from './imports.copy';

// The binary formats are PostgreSQL's own (array_recv, COPY BINARY): the checks go through a real
// server, which rejects a malformed array and returns what it understood.

let owner: Knex;

beforeAll(() => {
  owner = createOwnerDb();
});

afterAll(() => owner.destroy());

/** Doubles that text formatting or a careless encoder would change. */
const awkwardDoubles = [0.1 + 0.2, -0, 1e-300, 5e-324, 1.7976931348623157e308, -123.456, Number.MAX_SAFE_INTEGER + 2, Infinity, -Infinity];

describe('the staged file', () => {
  it('gives back the rows exactly as packed, rejected rows and every status included', () => {
    const rows = {
      rowCount: 4,
      rowNumbers: Int32Array.from([5, 6, 9, 1_048_576]),
      tUtcMs: Float64Array.from([Date.UTC(2026, 9, 25, 0, 59), NaN, Date.UTC(1999, 11, 31, 23, 59, 59, 999), 0]),
      statuses: ['valid', 'calibration', 'valid', 'out_of_range'],
    };
    const back = unpackStagedRows(packStagedRows(rows));
    expect(back.rowCount).toBe(4);
    expect([...back.rowNumbers]).toEqual([...rows.rowNumbers]);
    expect([...back.tUtcMs]).toEqual([...rows.tUtcMs]);
    expect(back.statuses).toEqual(rows.statuses);
  });

  it('gives back a value column bit for bit, blanks (NaN) included', () => {
    const values = Float64Array.from([...awkwardDoubles, NaN]);
    const back = unpackStagedColumn(packStagedColumn(values));
    expect(back).toHaveLength(values.length);
    values.forEach((v, i) => expect(Object.is(back[i], v)).toBe(true));
  });

  it('packs an empty file', () => {
    const back = unpackStagedRows(packStagedRows({ rowCount: 0, rowNumbers: new Int32Array(0), tUtcMs: new Float64Array(0), statuses: [] }));
    expect(back.rowCount).toBe(0);
    expect(unpackStagedColumn(packStagedColumn(new Float64Array(0)))).toHaveLength(0);
  });

  it('refuses a part cut short instead of reading past it', () => {
    const packed = packStagedColumn(Float64Array.from([1, 2, 3]));
    expect(() => unpackStagedColumn(packed.subarray(0, packed.length - 8))).toThrow(/wrong length/);
  });
});

describe('COPY … TO STDOUT in binary', () => {
  it('returns each field as its raw bytes and NULL as null', async () => {
    const rows = await owner.transaction((trx) => copyOutBinary(trx, "select 7::int4, '\\x00ff10'::bytea, null::bytea union all select -1, ''::bytea, '\\x41'::bytea"));
    expect(rows).toHaveLength(2);
    expect(rows[0]![0]!.readInt32BE(0)).toBe(7);
    expect([...rows[0]![1]!]).toEqual([0x00, 0xff, 0x10]);
    expect(rows[0]![2]).toBeNull();
    expect(rows[1]![0]!.readInt32BE(0)).toBe(-1);
    expect(rows[1]![1]!).toHaveLength(0);
    expect(rows[1]![2]!.toString('latin1')).toBe('A');
  });
});
