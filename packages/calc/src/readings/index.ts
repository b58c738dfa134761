/**
 * Readings: the raw time series of one monitored channel (pollutant or parameter), as the data
 * logger wrote it. Two shapes carry the same data:
 *
 * - `Reading[]` — one object per reading, convenient for small series and tests;
 * - `ReadingColumns` — three parallel typed arrays, the shape the hot paths read without
 *   allocating an object per reading (a year of 1-minute data is 525,600 readings).
 *
 * Timestamps are UTC epoch milliseconds. Readings may come at any regular interval
 * (1, 5, 10, 15, 30, 60 min) or irregularly.
 */
import { CalcInputError } from '../errors';

/**
 * What the data logger (or the officer, through a correction) says about a reading.
 *
 * - `valid` — a measured value the analyser vouches for.
 * - `calibration` — zero/span check or other quality-assurance activity; no emission value.
 * - `maintenance` — analyser or sampling line under maintenance.
 * - `fault` — analyser or data-acquisition malfunction.
 * - `out-of-range` — the value is outside the analyser's certified range.
 * - `not-operating` — the emission unit was not operating (no fuel fired).
 * - `startup-shutdown` — the unit was starting up or shutting down; IED Annex V Part 4 point 3
 *   disregards these periods when averaging.
 * - `substituted` — a value filled in under a substitution procedure, not measured.
 */
export const READING_STATUSES = [
  'valid',
  'calibration',
  'maintenance',
  'fault',
  'out-of-range',
  'not-operating',
  'startup-shutdown',
  'substituted',
] as const;

export type ReadingStatus = (typeof READING_STATUSES)[number];

/** Numeric code of each `ReadingStatus` in `ReadingColumns.status` (its index in `READING_STATUSES`). */
export const ReadingStatusCode = {
  valid: 0,
  calibration: 1,
  maintenance: 2,
  fault: 3,
  'out-of-range': 4,
  'not-operating': 5,
  'startup-shutdown': 6,
  substituted: 7,
} as const satisfies Record<ReadingStatus, number>;

/** One reading of one channel. `value` is null when the logger recorded no number. */
export interface Reading {
  /** UTC epoch milliseconds. */
  readonly t: number;
  /** In the channel's unit (e.g. mg/m3 wet, ppm, % O2); null when there is no number. */
  readonly value: number | null;
  readonly status: ReadingStatus;
}

/**
 * A channel's readings as parallel columns: `t[i]`, `value[i]` (NaN for "no value") and
 * `status[i]` (a `ReadingStatusCode`) describe reading i.
 */
export interface ReadingColumns {
  readonly t: Float64Array | readonly number[];
  readonly value: Float64Array | readonly number[];
  readonly status: Uint8Array;
}

/** Either shape of a reading series. */
export type ReadingInput = readonly Reading[] | ReadingColumns;

/** True when `input` is the column shape. */
export function isReadingColumns(input: ReadingInput): input is ReadingColumns {
  return !Array.isArray(input);
}

/**
 * Converts reading objects to columns (validating statuses and timestamps).
 *
 * @example
 * toReadingColumns([{ t: 0, value: 5, status: 'valid' }]).status //=> Uint8Array [0]
 */
export function toReadingColumns(readings: readonly Reading[]): ReadingColumns {
  const n = readings.length;
  const t = new Float64Array(n);
  const value = new Float64Array(n);
  const status = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const r = readings[i]!;
    if (!Number.isFinite(r.t)) {
      throw new CalcInputError(`Reading ${i} has no valid timestamp (UTC epoch milliseconds expected).`, `readings[${i}].t`);
    }
    const code = (ReadingStatusCode as Record<string, number>)[r.status];
    if (code === undefined) {
      throw new CalcInputError(
        `Reading ${i} has an unknown status "${String(r.status)}"; use one of ${READING_STATUSES.join(', ')}.`,
        `readings[${i}].status`,
      );
    }
    t[i] = r.t;
    value[i] = r.value === null || !Number.isFinite(r.value) ? NaN : r.value;
    status[i] = code;
  }
  return { t, value, status };
}

/** Number of readings in either shape. */
export function readingCount(input: ReadingInput): number {
  return isReadingColumns(input) ? input.t.length : input.length;
}
