/**
 * Raw readings → hourly (or half-hourly, 10-minute) values under a data-validity rule given as
 * data. One pass over the readings into typed-array accumulators: no object per reading.
 */
import { CalcInputError } from '../errors';
import { type ReadingInput, ReadingStatusCode, isReadingColumns, toReadingColumns } from '../readings';
import {
  type HourlySeries,
  HourReasonCode,
  HourStatusCode,
  allocateHourlySeries,
  millisecondsInMinute,
} from './series';

/**
 * When a period's data make a valid value. Rules are data, not code paths per regulation.
 *
 * - `quadrants` — at least one valid reading in each `quadrantMinutes` (15) part of the hour in
 *   which the unit operated (40 CFR 60.13(h)(2) and 75.10(d)(1) [memory on the exact wording]).
 *   With `qaHourVariant` (default true), an hour with calibration or maintenance readings instead
 *   needs two valid readings at least 15 minutes apart when the unit operated in two or more
 *   quadrants (40 CFR 60.13(h)(2)(iii) [memory]).
 * - `min-share` — valid readings cover at least `share` of the operating time. 2/3 is the usual
 *   choice in EU national guidance on evaluating continuous measurements (common practice,
 *   [memory]; the IED itself does not fix it).
 * - `min-count` — at least `count` valid readings.
 */
export type ValidityRule =
  | { readonly kind: 'quadrants'; readonly quadrantMinutes?: number; readonly qaHourVariant?: boolean }
  | { readonly kind: 'min-share'; readonly share: number }
  | { readonly kind: 'min-count'; readonly count: number };

export interface AggregateOptions {
  /** Length of the output periods: 60 (default), 30, 15 or 10 minutes. */
  readonly periodMinutes?: number;
  /** Validity rule; default `{ kind: 'quadrants' }`. */
  readonly rule?: ValidityRule;
  /** First and end (exclusive) of the periods to produce, UTC ms; default: spanned by the readings. */
  readonly from?: number;
  readonly to?: number;
  /** Logging interval in minutes, for coverage; default: the median spacing of the first readings. */
  readonly intervalMinutes?: number;
  /** Whether a timestamp marks the start (default) or the end of the interval it stands for. */
  readonly timestampMarks?: 'start' | 'end';
  /** Shift of period boundaries from UTC multiples (e.g. 30 for a UTC+05:30 site's clock hours). */
  readonly alignmentOffsetMinutes?: number;
  /** Whether substituted readings count as valid data (default true; the hour is then `substituted`). */
  readonly substitutedIsValid?: boolean;
  /** Status of a period with no readings at all: `invalid` (default, missing data) or `not-operating`. */
  readonly missingPeriod?: 'invalid' | 'not-operating';
}

const S = ReadingStatusCode;
const STATUS_COUNT = 8;

function inferIntervalMs(t: ArrayLike<number>, fallback: number): number {
  const n = Math.min(t.length, 1001);
  if (n < 2) return fallback;
  const d: number[] = [];
  for (let i = 1; i < n; i++) {
    const x = t[i]! - t[i - 1]!;
    if (x > 0) d.push(x);
  }
  if (d.length === 0) return fallback;
  d.sort((a, b) => a - b);
  return d[d.length >> 1]!;
}

function validateRule(rule: ValidityRule, periodMs: number): void {
  if (rule.kind === 'quadrants') {
    const q = (rule.quadrantMinutes ?? 15) * millisecondsInMinute;
    if (!(q > 0)) throw new CalcInputError('quadrantMinutes must be positive.', 'rule.quadrantMinutes');
    if (periodMs % Math.min(q, periodMs) !== 0) {
      throw new CalcInputError('quadrantMinutes must divide the period evenly.', 'rule.quadrantMinutes');
    }
    if (Math.ceil(periodMs / q) > 8) throw new CalcInputError('A period may have at most 8 quadrants.', 'rule.quadrantMinutes');
  } else if (rule.kind === 'min-share') {
    if (!(rule.share > 0 && rule.share <= 1)) throw new CalcInputError(`min-share needs 0 < share ≤ 1; got ${rule.share}.`, 'rule.share');
  } else if (rule.kind === 'min-count') {
    if (!(Number.isInteger(rule.count) && rule.count >= 1)) throw new CalcInputError(`min-count needs a whole count ≥ 1; got ${rule.count}.`, 'rule.count');
  } else {
    throw new CalcInputError(`Unknown validity rule ${JSON.stringify(rule)}.`, 'rule.kind');
  }
}

/**
 * Averages a channel's readings into periods (hours by default) and decides each period's
 * status under the validity rule. The value is the arithmetic mean of the valid readings
 * (40 CFR 60.13(h)(2) [memory]: "the arithmetic average of all valid data points"); it is kept
 * for invalid periods that have some valid readings, for display, but only `valid` and
 * `substituted` periods are averaged further. In a start-up/shut-down period the value is the
 * mean of the valid and start-up/shut-down readings (for mass totals), and the period is
 * disregarded by compliance averaging (IED Annex V Part 4 point 3).
 *
 * Readings need not be sorted; those outside [from, to) are ignored.
 *
 * @example
 * const minutes = Array.from({ length: 60 }, (_, m) => ({ t: m * 60_000, value: 80, status: 'valid' as const }));
 * aggregateHours(minutes).value[0] //=> 80
 */
export function aggregateHours(readings: ReadingInput, opts: AggregateOptions = {}): HourlySeries {
  const periodMinutes = opts.periodMinutes ?? 60;
  const periodMs = periodMinutes * millisecondsInMinute;
  if (!(periodMs > 0) || 86_400_000 % periodMs !== 0) {
    throw new CalcInputError(`periodMinutes must divide a day evenly (10, 15, 30, 60); got ${periodMinutes}.`, 'periodMinutes');
  }
  const rule: ValidityRule = opts.rule ?? { kind: 'quadrants' };
  validateRule(rule, periodMs);
  const cols = isReadingColumns(readings) ? readings : toReadingColumns(readings);
  // Float64Array everywhere keeps the hot loop monomorphic.
  const tt = cols.t instanceof Float64Array ? cols.t : Float64Array.from(cols.t);
  const vv = cols.value instanceof Float64Array ? cols.value : Float64Array.from(cols.value);
  const ss = cols.status;
  const n = tt.length;
  if (vv.length !== n || ss.length !== n) throw new CalcInputError('Reading columns t, value and status must have the same length.', 'readings');
  const shiftMs = opts.timestampMarks === 'end' ? -1 : 0;
  const offsetMs = (opts.alignmentOffsetMinutes ?? 0) * millisecondsInMinute;

  let minT = Infinity;
  let maxT = -Infinity;
  if (opts.from === undefined || opts.to === undefined) {
    for (let i = 0; i < n; i++) {
      const t = tt[i]!;
      if (t < minT) minT = t;
      if (t > maxT) maxT = t;
    }
  }
  const from = opts.from !== undefined ? floorToPeriod(opts.from, periodMs, offsetMs) : n ? floorToPeriod(minT + shiftMs, periodMs, offsetMs) : 0;
  const to =
    opts.to !== undefined
      ? Math.ceil((opts.to - offsetMs) / periodMs) * periodMs + offsetMs
      : n
        ? floorToPeriod(maxT + shiftMs, periodMs, offsetMs) + periodMs
        : from;
  if (!Number.isFinite(from) || !Number.isFinite(to)) throw new CalcInputError('Readings or from/to hold a timestamp that is not a number.', 'readings');
  const hours = Math.max(0, Math.round((to - from) / periodMs));

  const out = allocateHourlySeries(hours, periodMs);
  const sum = new Float64Array(hours);
  const suSum = new Float64Array(hours);
  const suCount = new Int32Array(hours);
  const counts = new Int32Array(hours * STATUS_COUNT);
  const anyMask = new Uint8Array(hours);
  const opMask = new Uint8Array(hours);
  const validMask = new Uint8Array(hours);
  const firstValidT = new Float64Array(hours).fill(Infinity);
  const lastValidT = new Float64Array(hours).fill(-Infinity);
  const subIsValid = opts.substitutedIsValid ?? true;
  const quadMs = rule.kind === 'quadrants' ? Math.min((rule.quadrantMinutes ?? 15) * millisecondsInMinute, periodMs) : periodMs;
  const noValueCount = new Int32Array(hours);
  const firstReading = out.firstReading;
  const lastReading = out.lastReading;

  // The hot loop: one pass, typed arrays only. Sorted input stays inside the current period for
  // many readings, so the period index is recomputed only when a reading leaves it.
  const notOperating = S['not-operating'];
  const validCode = S.valid;
  const substitutedCode = S.substituted;
  const suCode = S['startup-shutdown'];
  const validCount = out.validCount;
  let h = -1;
  let hStart = 0;
  let hEnd = -Infinity;
  for (let i = 0; i < n; i++) {
    const tb = tt[i]! + shiftMs;
    if (tb < hStart || tb >= hEnd) {
      const rel = tb - from;
      if (!(rel >= 0) || rel >= hours * periodMs) {
        hEnd = -Infinity;
        continue;
      }
      h = Math.floor(rel / periodMs);
      hStart = from + h * periodMs;
      hEnd = hStart + periodMs;
    }
    const st = ss[i]!;
    const v = vv[i]!;
    counts[h * STATUS_COUNT + st]!++;
    if (firstReading[h] === -1) firstReading[h] = i;
    else if (i < firstReading[h]!) firstReading[h] = i;
    if (i > lastReading[h]!) lastReading[h] = i;
    const qbit = 1 << (((tb - hStart) / quadMs) | 0);
    anyMask[h]! |= qbit;
    if (st === notOperating) continue;
    opMask[h]! |= qbit;
    if (st === validCode || (st === substitutedCode && subIsValid)) {
      if (v !== v) {
        noValueCount[h]!++;
        continue;
      }
      sum[h]! += v;
      validCount[h]!++;
      validMask[h]! |= qbit;
      if (tb < firstValidT[h]!) firstValidT[h] = tb;
      if (tb > lastValidT[h]!) lastValidT[h] = tb;
    } else if (st === suCode && v === v) {
      suSum[h]! += v;
      suCount[h]!++;
    }
  }

  const intervalMs = opts.intervalMinutes !== undefined ? opts.intervalMinutes * millisecondsInMinute : inferIntervalMs(tt, periodMs);
  if (!(intervalMs > 0)) throw new CalcInputError('intervalMinutes must be positive.', 'intervalMinutes');
  const expectedPerPeriod = periodMs / intervalMs;
  const nQuads = Math.ceil(periodMs / quadMs);
  const fullMask = (1 << nQuads) - 1;
  const qaSeparationMs = 15 * millisecondsInMinute;
  const R = HourReasonCode;

  for (let h = 0; h < hours; h++) {
    out.t[h] = from + h * periodMs;
    const base = h * STATUS_COUNT;
    let total = 0;
    for (let k = 0; k < STATUS_COUNT; k++) total += counts[base + k]!;
    out.readingCount[h] = total;
    const valid = out.validCount[h]!;
    if (valid > 0) out.value[h] = sum[h]! / valid;
    if (total === 0) {
      if ((opts.missingPeriod ?? 'invalid') === 'invalid') {
        out.status[h] = HourStatusCode.invalid;
        out.reason[h] = R['no-readings'];
        out.coverage[h] = 0;
      }
      continue;
    }
    const notOp = counts[base + S['not-operating']]!;
    const operating = total - notOp;
    const expectedOperating = Math.max(expectedPerPeriod - notOp, operating, 1);
    out.coverage[h] = Math.min(1, valid / expectedOperating);
    const su = counts[base + S['startup-shutdown']]!;
    if (su > 0) {
      out.status[h] = HourStatusCode['startup-shutdown'];
      const c = valid + suCount[h]!;
      out.value[h] = c > 0 ? (sum[h]! + suSum[h]!) / c : NaN;
      continue;
    }
    if (operating === 0) {
      out.status[h] = HourStatusCode['not-operating'];
      continue;
    }
    let failure = 0;
    if (rule.kind === 'quadrants') {
      // A quadrant without any reading counts as operated: missing data is not proof of a stop.
      const operated = (opMask[h]! | (~anyMask[h]! & fullMask)) & fullMask;
      const qa = counts[base + S.calibration]! + counts[base + S.maintenance]! > 0;
      if (qa && (rule.qaHourVariant ?? true)) {
        const operatedQuads = popcount(operated);
        if (operatedQuads >= 2) {
          if (valid < 2 || lastValidT[h]! - firstValidT[h]! < qaSeparationMs) failure = R['qa-hour-separation'];
        } else if (valid < 1) failure = R['quadrant-missing'];
      } else if ((validMask[h]! & operated) !== operated) {
        failure = R['quadrant-missing'];
      }
    } else if (rule.kind === 'min-share') {
      if (valid / expectedOperating < rule.share - 1e-9) failure = R['too-little-valid-time'];
    } else if (valid < rule.count) {
      failure = R['too-few-readings'];
    }
    if (failure) {
      out.status[h] = HourStatusCode.invalid;
      out.reason[h] = dominantCause(counts, base, noValueCount[h]!) ?? failure;
    } else {
      out.status[h] = counts[base + S.substituted]! > 0 && subIsValid ? HourStatusCode.substituted : HourStatusCode.valid;
    }
  }
  return out;
}

function floorToPeriod(t: number, periodMs: number, offsetMs: number): number {
  return Math.floor((t - offsetMs) / periodMs) * periodMs + offsetMs;
}

function popcount(x: number): number {
  let c = 0;
  for (; x; x &= x - 1) c++;
  return c;
}

/** The most frequent non-valid reading status of an invalid hour, as a reason code. */
function dominantCause(counts: Int32Array, base: number, noValue: number): number | undefined {
  const candidates: [number, number][] = [
    [counts[base + S.fault]!, HourReasonCode.fault],
    [counts[base + S.maintenance]!, HourReasonCode.maintenance],
    [counts[base + S.calibration]!, HourReasonCode.calibration],
    [counts[base + S['out-of-range']]!, HourReasonCode['out-of-range']],
    [noValue, HourReasonCode['no-value']],
  ];
  let best: [number, number] | undefined;
  for (const c of candidates) if (c[0] > 0 && (!best || c[0] > best[0])) best = c;
  return best?.[1];
}
