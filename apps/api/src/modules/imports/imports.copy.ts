/**
 * Bulk transfer between the import module and PostgreSQL, without turning numbers into text:
 * - COPY … FROM STDIN (pg-copy-streams) on the connection of a knex transaction, so the load is
 *   part of the transaction and rolls back with it; and COPY (query) TO STDOUT in binary, which
 *   hands a bytea over as its raw bytes (a bytea column in an ordinary result is hex text, twice
 *   the size, encoded by the server and decoded here);
 * - arrays in PostgreSQL's binary array format (the format of `array_recv`) as query parameters:
 *   node-postgres sends a Buffer parameter in binary, so `?::float8[]` reaches the server as
 *   doubles that need no parsing;
 * - the staged file: a parsed file packed into a few byte strings (`packStagedRows`,
 *   `packStagedColumn`), one per part, stored as they are and read back without parsing.
 */
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Knex } from 'knex';
import type { PoolClient } from 'pg';
import { from as copyFrom, to as copyTo } from 'pg-copy-streams';

/** Escapes one field for COPY's text format (null → \N). */
export function copyField(value: string | number | null): string {
  if (value === null) return '\\N';
  if (typeof value === 'number') return String(value);
  return value.replace(/[\\\t\n\r]/g, (ch) => (ch === '\\' ? '\\\\' : ch === '\t' ? '\\t' : ch === '\n' ? '\\n' : '\\r'));
}

/**
 * Streams lines (without newline) into `COPY <target> FROM STDIN` on the transaction's connection.
 * Lines are sent in chunks of a few hundred to keep the number of stream writes small.
 */
export async function copyLines(trx: Knex.Transaction, copySql: string, lines: Iterable<string>): Promise<void> {
  // A knex transaction's client hands out the transaction's own connection.
  const connection = (await (trx.client as { acquireConnection(): Promise<PoolClient> }).acquireConnection()) as PoolClient;
  const stream = connection.query(copyFrom(copySql));
  function* chunks(): Generator<string> {
    let buffer: string[] = [];
    for (const line of lines) {
      buffer.push(line);
      if (buffer.length >= 500) {
        yield `${buffer.join('\n')}\n`;
        buffer = [];
      }
    }
    if (buffer.length > 0) yield `${buffer.join('\n')}\n`;
  }
  await pipeline(Readable.from(chunks()), stream);
}

/**
 * Runs `COPY (<query>) TO STDOUT (FORMAT binary)` on the transaction's connection and returns the
 * rows, each field as its raw binary form (null for NULL). COPY takes no parameters: the caller
 * inlines only values it has validated (uuids, integers).
 *
 * Layout (PostgreSQL documentation, COPY, "Binary Format"): an 11-byte signature, int32 flags,
 * int32 header-extension length and the extension; per row an int16 field count (-1 ends the
 * data), per field an int32 byte length (-1 = NULL) and the bytes.
 */
export async function copyOutBinary(trx: Knex.Transaction, query: string): Promise<(Buffer | null)[][]> {
  const connection = (await (trx.client as { acquireConnection(): Promise<PoolClient> }).acquireConnection()) as PoolClient;
  const chunks: Buffer[] = [];
  const stream = connection.query(copyTo(`COPY (${query}) TO STDOUT (FORMAT binary)`));
  for await (const chunk of stream) chunks.push(chunk as Buffer);
  const data = chunks.length === 1 ? chunks[0]! : Buffer.concat(chunks);
  const signature = 'PGCOPY\n\xff\r\n\0';
  if (data.toString('latin1', 0, 11) !== signature) throw new Error('COPY binary: unexpected signature');
  let at = 15 + 4 + data.readInt32BE(15);
  const rows: (Buffer | null)[][] = [];
  for (;;) {
    const fields = data.readInt16BE(at);
    at += 2;
    if (fields < 0) break;
    const row = new Array<Buffer | null>(fields);
    for (let f = 0; f < fields; f++) {
      const length = data.readInt32BE(at);
      at += 4;
      if (length < 0) {
        row[f] = null;
        continue;
      }
      row[f] = data.subarray(at, at + length);
      at += length;
    }
    rows.push(row);
  }
  return rows;
}

// ---- binary array parameters ------------------------------------------------------------------
//
// Layout (PostgreSQL src/backend/utils/adt/arrayfuncs.c, array_recv): int32 number of dimensions,
// int32 flags (1 = has nulls), uint32 element type oid, per dimension int32 length and int32 lower
// bound; then per element int32 byte length (-1 = NULL) and the element's own binary form, all
// big-endian. Element forms: uuid as its 16 bytes, float8 as a big-endian double, timestamptz as
// int64 microseconds since 2000-01-01 UTC, text as its UTF-8 bytes.

const oidText = 25;
const oidFloat8 = 701;
const oidTimestamptz = 1184;
const oidUuid = 2950;
const headerBytes = 20;
/** 2000-01-01T00:00:00Z, PostgreSQL's timestamp epoch, in Unix ms. */
const pgEpochUnixMs = 946_684_800_000;
const twoPow32 = 4_294_967_296;

function arrayBuffer(elementOid: number, length: number, dataBytes: number, hasNull: boolean): { buffer: Buffer; view: DataView } {
  const buffer = Buffer.allocUnsafe(headerBytes + dataBytes);
  const view = new DataView(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  view.setInt32(0, 1);
  view.setInt32(4, hasNull ? 1 : 0);
  view.setUint32(8, elementOid);
  view.setInt32(12, length);
  view.setInt32(16, 1);
  return { buffer, view };
}

/** A float8[] parameter; NaN is sent as NULL. */
export function float8Param(values: ArrayLike<number>): Buffer {
  let nulls = 0;
  for (let i = 0; i < values.length; i++) if (Number.isNaN(values[i]!)) nulls++;
  const { buffer, view } = arrayBuffer(oidFloat8, values.length, values.length * 12 - nulls * 8, nulls > 0);
  let at = headerBytes;
  for (let i = 0; i < values.length; i++) {
    const value = values[i]!;
    if (Number.isNaN(value)) {
      view.setInt32(at, -1);
      at += 4;
    } else {
      view.setInt32(at, 8);
      view.setFloat64(at + 4, value);
      at += 12;
    }
  }
  return buffer;
}

/**
 * A timestamptz[] parameter of Unix-ms instants; a non-finite instant is sent as NULL. Whole
 * milliseconds, as a JavaScript Date holds them (a fraction is cut as `new Date(ms)` cuts it).
 */
export function timestamptzParam(unixMs: ArrayLike<number>): Buffer {
  let nulls = 0;
  for (let i = 0; i < unixMs.length; i++) if (!Number.isFinite(unixMs[i]!)) nulls++;
  const { buffer, view } = arrayBuffer(oidTimestamptz, unixMs.length, unixMs.length * 12 - nulls * 8, nulls > 0);
  let at = headerBytes;
  for (let i = 0; i < unixMs.length; i++) {
    const ms = unixMs[i]!;
    if (!Number.isFinite(ms)) {
      view.setInt32(at, -1);
      at += 4;
      continue;
    }
    // Microseconds since 2000 stay far below 2^53 for any plausible date: exact as doubles.
    const micros = (Math.trunc(ms) - pgEpochUnixMs) * 1000;
    const high = Math.floor(micros / twoPow32);
    view.setInt32(at, 8);
    view.setInt32(at + 4, high);
    view.setUint32(at + 8, micros - high * twoPow32);
    at += 12;
  }
  return buffer;
}

/** A text[] parameter (no NULLs). */
export function textParam(values: readonly string[]): Buffer {
  const names = [...new Set(values)];
  const index = new Map(names.map((name, k) => [name, k]));
  return textCodesParam(
    values.map((v) => index.get(v)!),
    names,
  );
}

/** A text[] parameter of `names[codes[i]]` (few distinct strings, such as statuses; no NULLs). */
export function textCodesParam(codes: ArrayLike<number>, names: readonly string[]): Buffer {
  const encoded = names.map((name) => Buffer.from(name, 'utf8'));
  let bytes = 0;
  for (let i = 0; i < codes.length; i++) bytes += 4 + encoded[codes[i]!]!.length;
  const { buffer, view } = arrayBuffer(oidText, codes.length, bytes, false);
  let at = headerBytes;
  for (let i = 0; i < codes.length; i++) {
    const utf8 = encoded[codes[i]!]!;
    view.setInt32(at, utf8.length);
    utf8.copy(buffer, at + 4);
    at += 4 + utf8.length;
  }
  return buffer;
}

/** A uuid[] parameter: ids[0] repeated counts[0] times, then ids[1] counts[1] times, and so on. */
export function uuidRunsParam(ids: readonly string[], counts: readonly number[]): Buffer {
  const length = counts.reduce((sum, n) => sum + n, 0);
  const { buffer, view } = arrayBuffer(oidUuid, length, length * 20, false);
  let at = headerBytes;
  ids.forEach((id, k) => {
    const hex = id.replace(/-/g, '');
    if (!/^[0-9a-fA-F]{32}$/.test(hex)) throw new Error(`not a uuid: ${id}`);
    const bytes = Buffer.from(hex, 'hex');
    for (let i = 0; i < counts[k]!; i++) {
      view.setInt32(at, 16);
      bytes.copy(buffer, at + 4);
      at += 20;
    }
  });
  return buffer;
}

// ---- the staged file ------------------------------------------------------------------------------
//
// A parsed file is staged as byte strings: part 0 holds the row fields (times, row numbers,
// statuses), part k the k-th value column. Little-endian, each section at an offset that is a
// multiple of 8:
//   part 0: int32 version, int32 rowCount, int32 byte length L of the status names (UTF-8, joined
//           by "\n"), the names, zero padding; float64 tUtcMs[rowCount] (NaN = rejected row),
//           int32 rowNumbers[rowCount], uint8 status[rowCount] (index into the names)
//   part k: int32 version, int32 rowCount, float64 values[rowCount] (NaN = no number in the cell)

const stagedVersion = 1;

/** The row fields of a staged file (part 0). */
export interface StagedRows {
  rowCount: number;
  /** Sheet row number of each row. */
  rowNumbers: Int32Array;
  /** Start of the interval each row covers, UTC ms; NaN when the row is rejected. */
  tUtcMs: Float64Array;
  statuses: readonly string[];
}

function padTo8(n: number): number {
  return Math.ceil(n / 8) * 8;
}

export function packStagedRows(rows: StagedRows): Buffer {
  const { rowCount } = rows;
  const names: string[] = [];
  const indexOf = new Map<string, number>();
  const codes = new Uint8Array(rowCount);
  for (let i = 0; i < rowCount; i++) {
    const status = rows.statuses[i]!;
    let code = indexOf.get(status);
    if (code === undefined) {
      code = names.length;
      if (code > 255) throw new Error('staged file: more than 256 statuses');
      indexOf.set(status, code);
      names.push(status);
    }
    codes[i] = code;
  }
  const nameBytes = Buffer.from(names.join('\n'), 'utf8');
  const tAt = padTo8(12 + nameBytes.length);
  const rowNumbersAt = tAt + rowCount * 8;
  const statusAt = rowNumbersAt + rowCount * 4;
  const buffer = Buffer.alloc(statusAt + rowCount);
  const view = new DataView(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  view.setInt32(0, stagedVersion, true);
  view.setInt32(4, rowCount, true);
  view.setInt32(8, nameBytes.length, true);
  nameBytes.copy(buffer, 12);
  for (let i = 0; i < rowCount; i++) {
    view.setFloat64(tAt + i * 8, rows.tUtcMs[i]!, true);
    view.setInt32(rowNumbersAt + i * 4, rows.rowNumbers[i]!, true);
  }
  buffer.set(codes, statusAt);
  return buffer;
}

export function unpackStagedRows(bytes: Buffer): StagedRows {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (view.getInt32(0, true) !== stagedVersion) throw new Error('staged file: unknown version');
  const rowCount = view.getInt32(4, true);
  const nameLength = view.getInt32(8, true);
  const names = nameLength === 0 ? [] : bytes.toString('utf8', 12, 12 + nameLength).split('\n');
  const tAt = padTo8(12 + nameLength);
  const rowNumbersAt = tAt + rowCount * 8;
  const statusAt = rowNumbersAt + rowCount * 4;
  if (bytes.length !== statusAt + rowCount) throw new Error('staged file: rows part has the wrong length');
  const tUtcMs = new Float64Array(rowCount);
  const rowNumbers = new Int32Array(rowCount);
  const statuses = new Array<string>(rowCount);
  for (let i = 0; i < rowCount; i++) {
    tUtcMs[i] = view.getFloat64(tAt + i * 8, true);
    rowNumbers[i] = view.getInt32(rowNumbersAt + i * 4, true);
    statuses[i] = names[bytes[statusAt + i]!]!;
  }
  return { rowCount, rowNumbers, tUtcMs, statuses };
}

export function packStagedColumn(values: Float64Array): Buffer {
  const buffer = Buffer.alloc(8 + values.length * 8);
  const view = new DataView(buffer.buffer, buffer.byteOffset, buffer.byteLength);
  view.setInt32(0, stagedVersion, true);
  view.setInt32(4, values.length, true);
  for (let i = 0; i < values.length; i++) view.setFloat64(8 + i * 8, values[i]!, true);
  return buffer;
}

export function unpackStagedColumn(bytes: Buffer): Float64Array {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  if (view.getInt32(0, true) !== stagedVersion) throw new Error('staged file: unknown version');
  const rowCount = view.getInt32(4, true);
  if (bytes.length !== 8 + rowCount * 8) throw new Error('staged file: column part has the wrong length');
  const values = new Float64Array(rowCount);
  for (let i = 0; i < rowCount; i++) values[i] = view.getFloat64(8 + i * 8, true);
  return values;
}
