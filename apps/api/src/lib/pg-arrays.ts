/**
 * Arrays in PostgreSQL's binary array format (the format of `array_recv`) as query parameters:
 * node-postgres sends a Buffer parameter in binary, so `?::float8[]` reaches the server as doubles
 * that need no parsing, and nothing is turned into text on either side. Used for bulk writes
 * (`insert … select … unnest(?::float8[], …)`): an import's readings, the hourly results.
 */

// Layout (PostgreSQL src/backend/utils/adt/arrayfuncs.c, array_recv): int32 number of dimensions,
// int32 flags (1 = has nulls), uint32 element type oid, per dimension int32 length and int32 lower
// bound; then per element int32 byte length (-1 = NULL) and the element's own binary form, all
// big-endian. Element forms: uuid as its 16 bytes, float8 as a big-endian double, timestamptz as
// int64 microseconds since 2000-01-01 UTC, text as its UTF-8 bytes.

const oidText = 25;
const oidFloat8 = 701;
const oidTimestamptz = 1184;
const oidUuid = 2950;
const oidInt4 = 23;
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


/** An int4[] parameter (integers in int4's range; no NULLs). */
export function int4Param(values: ArrayLike<number>): Buffer {
  const { buffer, view } = arrayBuffer(oidInt4, values.length, values.length * 8, false);
  let at = headerBytes;
  for (let i = 0; i < values.length; i++) {
    const value = values[i]!;
    if (!Number.isInteger(value) || value < -2_147_483_648 || value > 2_147_483_647) throw new Error(`not an int4: ${value}`);
    view.setInt32(at, 4);
    view.setInt32(at + 4, value);
    at += 8;
  }
  return buffer;
}

/** A text[] parameter that may hold NULLs (null elements). */
export function nullableTextParam(values: readonly (string | null)[]): Buffer {
  const encoded = values.map((v) => (v === null ? null : Buffer.from(v, 'utf8')));
  let bytes = 0;
  let nulls = false;
  for (const utf8 of encoded) {
    if (utf8 === null) {
      bytes += 4;
      nulls = true;
    } else bytes += 4 + utf8.length;
  }
  const { buffer, view } = arrayBuffer(oidText, values.length, bytes, nulls);
  let at = headerBytes;
  for (const utf8 of encoded) {
    if (utf8 === null) {
      view.setInt32(at, -1);
      at += 4;
    } else {
      view.setInt32(at, utf8.length);
      utf8.copy(buffer, at + 4);
      at += 4 + utf8.length;
    }
  }
  return buffer;
}
