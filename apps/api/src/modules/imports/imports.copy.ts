/**
 * Bulk transfer between the import module and PostgreSQL, without turning numbers into text:
 * - COPY … FROM STDIN (pg-copy-streams) on the connection of a knex transaction, so the load is
 *   part of the transaction and rolls back with it; and COPY (query) TO STDOUT in binary, which
 *   hands a bytea over as its raw bytes (a bytea column in an ordinary result is hex text, twice
 *   the size, encoded by the server and decoded here);
 * - (arrays as binary query parameters are in lib/pg-arrays.ts);
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
