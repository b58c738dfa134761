import type { Knex } from 'knex';
import { createOwnerDb } from '../../test-support/test-app';
import {
  copyOutBinary,
  float8Param,
  packStagedColumn,
  packStagedRows,
  textParam,
  timestamptzParam,
  unpackStagedColumn,
  unpackStagedRows,
  uuidRunsParam,
} from './imports.copy';

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

describe('binary array parameters, as PostgreSQL reads them', () => {
  it('float8[]: every double exactly, NaN as NULL', async () => {
    const { rows } = await owner.raw('select v, v::text as text from unnest(?::float8[]) with ordinality as u(v, i) order by i', [float8Param([...awkwardDoubles, NaN])]);
    expect(rows.map((r: { v: number | null }) => r.v)).toEqual([...awkwardDoubles, null]);
    // -0 survives as -0 (the text output shows it).
    expect(rows[1].text).toBe('-0');
  });

  it('timestamptz[]: whole milliseconds, before and after 2000, NaN as NULL, fractions cut like a Date', async () => {
    const instants = [Date.UTC(2026, 9, 25, 0, 59, 59, 999), Date.UTC(1999, 11, 31, 23, 59, 59, 999), NaN, Date.UTC(2026, 0, 1) + 0.75, Date.UTC(1970, 0, 1)];
    const { rows } = await owner.raw(
      `select to_char(t at time zone 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.US') as t from unnest(?::timestamptz[]) with ordinality as u(t, i) order by i`,
      [timestamptzParam(instants)],
    );
    expect(rows.map((r: { t: string | null }) => r.t)).toEqual([
      '2026-10-25T00:59:59.999000',
      '1999-12-31T23:59:59.999000',
      null,
      '2026-01-01T00:00:00.000000',
      '1970-01-01T00:00:00.000000',
    ]);
  });

  it('text[]: UTF-8, empty strings and repeats', async () => {
    const values = ['valid', 'Störung ✓', '', 'valid'];
    const { rows } = await owner.raw('select array_agg(v order by i) as v from unnest(?::text[]) with ordinality as u(v, i)', [textParam(values)]);
    expect(rows[0].v).toEqual(values);
  });

  it('uuid[]: each id repeated its count, in order', async () => {
    const a = '0b0e5cf2-8a0b-4f0e-9a53-1f4f0d5c8a01';
    const b = 'E3A1C9D4-1B2C-4D5E-8F90-A1B2C3D4E5F6';
    const { rows } = await owner.raw('select array_agg(v::text order by i) as v from unnest(?::uuid[]) with ordinality as u(v, i)', [uuidRunsParam([a, b], [2, 1])]);
    expect(rows[0].v).toEqual([a, a, b.toLowerCase()]);
    expect(() => uuidRunsParam(['not-a-uuid'], [1])).toThrow(/not a uuid/);
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
