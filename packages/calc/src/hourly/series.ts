/**
 * Hourly (or half-hourly, 10-minute) values of one channel, in a column shape the averaging
 * engine reads without allocating, and the object shape (`HourlyValue`) the API stores and reads.
 */
import { CalcInputError } from '../errors';

/** Milliseconds in one hour (60 · 60 · 1000). */
export const millisecondsInHour = 3_600_000;
/** Milliseconds in one minute. */
export const millisecondsInMinute = 60_000;

/**
 * Status of an hourly value.
 *
 * - `valid` — enough valid readings under the validity rule.
 * - `substituted` — valid, but fed (partly) by substituted readings.
 * - `invalid` — the unit operated but the data do not make a valid value (see the reason).
 * - `not-operating` — the unit did not operate in the hour.
 * - `startup-shutdown` — start-up or shut-down in the hour; disregarded when averaging under
 *   IED Annex V Part 4 point 3, so neither valid nor counted as invalid.
 */
export const HOUR_STATUSES = ['valid', 'substituted', 'invalid', 'not-operating', 'startup-shutdown'] as const;
export type HourStatus = (typeof HOUR_STATUSES)[number];

/** Numeric code of each `HourStatus` in `HourlySeries.status`. */
export const HourStatusCode = {
  valid: 0,
  substituted: 1,
  invalid: 2,
  'not-operating': 3,
  'startup-shutdown': 4,
} as const satisfies Record<HourStatus, number>;

/**
 * Why an hour is invalid (or `none`). Reading-level causes (`fault`, `maintenance`,
 * `calibration`, `out-of-range`, `no-value`) name the most frequent non-valid reading status in
 * the hour; the others come from the validity rule or from the derivation step.
 */
export const HOUR_REASONS = [
  'none',
  'no-readings',
  'fault',
  'maintenance',
  'calibration',
  'out-of-range',
  'no-value',
  'quadrant-missing',
  'qa-hour-separation',
  'too-little-valid-time',
  'too-few-readings',
  'o2-invalid',
  'o2-out-of-range',
  'moisture-invalid',
  'conditions-invalid',
  'flow-invalid',
] as const;
export type HourReason = (typeof HOUR_REASONS)[number];

/** Numeric code of each `HourReason` (its index in `HOUR_REASONS`). */
export const HourReasonCode = Object.fromEntries(HOUR_REASONS.map((r, i) => [r, i])) as {
  readonly [K in HourReason]: number;
};

/**
 * Hourly values as parallel columns; index i describes the period starting at `t[i]`.
 * Periods are `periodMs` long (one hour, or 30/10 minutes) and sorted by time.
 */
export interface HourlySeries {
  /** Length of each period in ms (3,600,000 for hours). */
  readonly periodMs: number;
  /** Period start, UTC epoch ms, ascending. */
  readonly t: Float64Array;
  /** Mean of the period's valid readings in the channel's unit; NaN when there is none. */
  readonly value: Float64Array;
  /** `HourStatusCode` of each period. */
  readonly status: Uint8Array;
  /** `HourReasonCode` of each period (0 = none). */
  readonly reason: Uint8Array;
  /** Share (0–1) of the operating time covered by valid readings; NaN when unknown. */
  readonly coverage: Float64Array;
  /** Number of valid readings averaged into the value. */
  readonly validCount: Int32Array;
  /** Number of readings that fell into the period. */
  readonly readingCount: Int32Array;
  /** Index of the first and last reading (in the input series) that fell into the period; -1 when none. */
  readonly firstReading: Int32Array;
  readonly lastReading: Int32Array;
}

/**
 * One stored hourly value, as the API keeps it in a table row.
 */
export interface HourlyValue {
  /** Start of the hour, UTC epoch ms. */
  readonly t: number;
  /** Value in the channel's unit; null when there is none. */
  readonly value: number | null;
  readonly status: HourStatus;
  /** Share (0–1) of the operating time covered by valid readings, if known. */
  readonly coverage?: number | null;
  readonly reason?: HourReason | null;
  readonly validCount?: number;
  readonly readingCount?: number;
  /** Index of the first and last raw reading (in the series it was built from) that fed the value. */
  readonly firstReading?: number;
  readonly lastReading?: number;
}

/** Allocates an empty series of `n` periods (values NaN, status `not-operating`). */
export function allocateHourlySeries(n: number, periodMs: number): HourlySeries & { t: Float64Array } {
  const s = {
    periodMs,
    t: new Float64Array(n),
    value: new Float64Array(n).fill(NaN),
    status: new Uint8Array(n).fill(HourStatusCode['not-operating']),
    reason: new Uint8Array(n),
    coverage: new Float64Array(n).fill(NaN),
    validCount: new Int32Array(n),
    readingCount: new Int32Array(n),
    firstReading: new Int32Array(n).fill(-1),
    lastReading: new Int32Array(n).fill(-1),
  };
  return s;
}

/**
 * Builds a column series from stored hourly values (e.g. table rows `t, value, status,
 * coverage`). Rows are sorted by time; duplicate hours and unknown statuses are refused.
 *
 * @param periodMinutes length of each stored period (60 for hourly values, 30 for half-hours).
 * @example
 * hourlySeriesFromValues([{ t: 0, value: 80, status: 'valid', coverage: 1 }]).value[0] //=> 80
 */
export function hourlySeriesFromValues(rows: readonly HourlyValue[], periodMinutes = 60): HourlySeries {
  const periodMs = periodMinutes * millisecondsInMinute;
  if (!(periodMs > 0) || 86_400_000 % periodMs !== 0) {
    throw new CalcInputError(`periodMinutes must divide a day evenly (e.g. 10, 15, 30, 60); got ${periodMinutes}.`, 'periodMinutes');
  }
  const sorted = [...rows].sort((a, b) => a.t - b.t);
  const s = allocateHourlySeries(sorted.length, periodMs);
  for (let i = 0; i < sorted.length; i++) {
    const r = sorted[i]!;
    if (!Number.isFinite(r.t)) throw new CalcInputError(`Hourly value ${i} has no valid timestamp.`, `rows[${i}].t`);
    if (i > 0 && r.t === sorted[i - 1]!.t) {
      throw new CalcInputError(`Two hourly values share the start ${new Date(r.t).toISOString()}; keep one per period.`, `rows[${i}].t`);
    }
    const code = (HourStatusCode as Record<string, number>)[r.status];
    if (code === undefined) {
      throw new CalcInputError(`Hourly value ${i} has an unknown status "${String(r.status)}"; use one of ${HOUR_STATUSES.join(', ')}.`, `rows[${i}].status`);
    }
    const reason = r.reason ? (HourReasonCode as Record<string, number>)[r.reason] : 0;
    if (reason === undefined) {
      throw new CalcInputError(`Hourly value ${i} has an unknown reason "${String(r.reason)}".`, `rows[${i}].reason`);
    }
    const value = r.value === null || r.value === undefined || !Number.isFinite(r.value) ? NaN : r.value;
    const usable = code === HourStatusCode.valid || code === HourStatusCode.substituted;
    if (usable && Number.isNaN(value)) {
      throw new CalcInputError(`Hourly value ${i} is marked ${r.status} but has no number.`, `rows[${i}].value`);
    }
    s.t[i] = r.t;
    s.value[i] = value;
    s.status[i] = code;
    s.reason[i] = reason;
    s.coverage[i] = r.coverage ?? NaN;
    s.validCount[i] = r.validCount ?? 0;
    s.readingCount[i] = r.readingCount ?? 0;
    s.firstReading[i] = r.firstReading ?? -1;
    s.lastReading[i] = r.lastReading ?? -1;
  }
  return s;
}

/** The status of period i as a word. */
export function hourStatusAt(series: HourlySeries, i: number): HourStatus {
  return HOUR_STATUSES[series.status[i]!]!;
}

/** Converts a column series to stored-row objects (one per period). */
export function hourlyValuesFromSeries(series: HourlySeries): HourlyValue[] {
  const out: HourlyValue[] = new Array(series.t.length);
  for (let i = 0; i < series.t.length; i++) {
    const v = series.value[i]!;
    const c = series.coverage[i]!;
    out[i] = {
      t: series.t[i]!,
      value: Number.isNaN(v) ? null : v,
      status: HOUR_STATUSES[series.status[i]!]!,
      coverage: Number.isNaN(c) ? null : c,
      reason: series.reason[i] ? HOUR_REASONS[series.reason[i]!]! : null,
      validCount: series.validCount[i]!,
      readingCount: series.readingCount[i]!,
      firstReading: series.firstReading[i]!,
      lastReading: series.lastReading[i]!,
    };
  }
  return out;
}

/** True when period i of the series holds a usable (valid or substituted) value. */
export function isUsableHour(series: HourlySeries, i: number): boolean {
  const s = series.status[i]!;
  return (s === HourStatusCode.valid || s === HourStatusCode.substituted) && !Number.isNaN(series.value[i]!);
}
