import type { Knex } from 'knex';
import { createOwnerDb } from '../test-support/test-app';
import { float8Param, int4Param, nullableTextParam, textParam, timestamptzParam, uuidRunsParam } from './pg-arrays';

// The binary format is PostgreSQL's own (array_recv): the checks go through a real server, which
// rejects a malformed array and returns what it understood.

let owner: Knex;

beforeAll(() => {
  owner = createOwnerDb();
});

afterAll(() => owner.destroy());

/** Doubles that text formatting or a careless encoder would change. */
const awkwardDoubles = [0.1 + 0.2, -0, 1e-300, 5e-324, 1.7976931348623157e308, -123.456, Number.MAX_SAFE_INTEGER + 2, Infinity, -Infinity];

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

  it('int4[]: negatives, zero and the range ends; refuses what int4 cannot hold', async () => {
    const values = [0, -1, 60, 2_147_483_647, -2_147_483_648];
    const { rows } = await owner.raw('select array_agg(v order by i) as v from unnest(?::int4[]) with ordinality as u(v, i)', [int4Param(values)]);
    expect(rows[0].v).toEqual(values);
    expect(() => int4Param([2_147_483_648])).toThrow(/not an int4/);
    expect(() => int4Param([1.5])).toThrow(/not an int4/);
  });

  it('text[] with NULLs: NULL, empty string and UTF-8 stay apart', async () => {
    const values = [null, '', 'calibration hour', null, 'Ü ✓'];
    const { rows } = await owner.raw('select v, v is null as missing from unnest(?::text[]) with ordinality as u(v, i) order by i', [nullableTextParam(values)]);
    expect(rows.map((r: { v: string | null }) => r.v)).toEqual(values);
    expect(rows.map((r: { missing: boolean }) => r.missing)).toEqual([true, false, false, true, false]);
    const none = await owner.raw('select count(*)::int as n from unnest(?::text[]) as u(v) where v is null', [nullableTextParam(['a', 'b'])]);
    expect(none.rows[0].n).toBe(0);
  });
});
