/**
 * Averages of hourly values over periods: calendar periods in the site's local calendar,
 * rolling windows of N (operating) days or hours, fixed blocks of N hours — each with
 * minimum-data rules, validated values (confidence interval subtracted) and the indices of the
 * hours that fed it, so every figure traces back to its hourly values.
 */
import { CalcInputError } from '../errors';
import { type HourStatus, type HourlySeries, HOUR_STATUSES, HourStatusCode } from '../hourly/series';
import { type CalendarPeriod, assertTimeZone, localPeriodBoundaries } from '../periods';

/**
 * Minimum data for a period or window to give a valid average.
 */
export interface MinDataRule {
  /** A day with more invalid hours than this is invalid: 3 under IED Annex V Part 3 point 11 [pub]. */
  readonly maxInvalidHoursPerDay?: number;
  /** At least this many valid hours in the period or window. */
  readonly minValidHours?: number;
  /** At least this share (0–1) of the operating hours valid. */
  readonly minValidShare?: number;
  /**
   * Rolling windows: at least `minValidHoursPerDay` valid hours on at least `minValidDays` of the
   * window's days (e.g. 18 hours on 22 of 30 days for 40 CFR 60 boiler rules [memory]; Method 19
   * §12.7 covers compliance when that minimum is not met [pub: section title]).
   */
  readonly minValidHoursPerDay?: number;
  readonly minValidDays?: number;
}

/** Status of an averaged period. `incomplete`: the period is still in progress or its window not yet full. */
export type PeriodStatus = 'valid' | 'invalid' | 'not-operating' | 'incomplete';

/** One averaged period (or rolling window, or block). */
export interface PeriodValue {
  /** Reporting slot [start, end), UTC ms: the calendar period or block, or the last day/hour of a rolling window. */
  readonly start: number;
  readonly end: number;
  /** Start of the averaged window (equals `start` except for rolling averages). */
  readonly windowStart: number;
  /** Mean of the (validated, if a confidence interval applies) usable hourly values; null when none. */
  readonly value: number | null;
  /** Mean of the same hours before subtracting the confidence interval. */
  readonly measuredValue: number | null;
  readonly status: PeriodStatus;
  /** Why the period is invalid or incomplete, in words. */
  readonly note?: string;
  readonly validHours: number;
  /** Hours in which the unit operated but the data were invalid. */
  readonly invalidHours: number;
  /** Hours left out by the rule (start-up/shut-down and other excluded statuses). */
  readonly excludedHours: number;
  readonly notOperatingHours: number;
  /** Clock hours (periods) of the slot or window. */
  readonly totalHours: number;
  /** Days with more invalid hours than allowed (for periods of a day or longer, when the rule sets it). */
  readonly invalidDays?: number;
  /** Indices [hourFrom, hourTo) into the hourly series of the hours inside the window. */
  readonly hourFrom: number;
  readonly hourTo: number;
}

export interface AveragingOptions {
  /** The site's IANA time zone (periods follow its local calendar). */
  readonly timeZone: string;
  /** Interval of periods to report, UTC ms [from, to); default: the series' span. */
  readonly from?: number;
  readonly to?: number;
  /**
   * Confidence interval in the value's unit, subtracted from every usable hourly value with a
   * floor of 0 (validated values, IED Annex V Part 3 point 10); default 0.
   */
  readonly confidenceInterval?: number;
  /** Hour statuses left out of averages; default `['startup-shutdown']` (IED Annex V Part 4 point 3). */
  readonly excludeStatuses?: readonly HourStatus[];
  readonly minData?: MinDataRule;
  /** End of the data received so far (UTC ms); periods ending later are `incomplete`. Default: end of the series. */
  readonly dataEnd?: number;
}

/** Hour classes used by all averages. */
export const HourClass = { Usable: 0, Invalid: 1, Excluded: 2, NotOperating: 3 } as const;

/** Per-hour class and (validated) value, prepared once per series and rule. */
export interface PreparedHours {
  readonly cls: Uint8Array;
  /** Validated value of usable hours (NaN otherwise). */
  readonly v: Float64Array;
  /** Measured value of usable hours (NaN otherwise). */
  readonly m: Float64Array;
}

/**
 * Classifies every hour and computes its validated value. Exposed for the compliance and
 * headroom modules; most callers want `periodAverages` and friends.
 */
export function prepareHours(series: HourlySeries, opts: Pick<AveragingOptions, 'confidenceInterval' | 'excludeStatuses'>): PreparedHours {
  const n = series.t.length;
  const ci = opts.confidenceInterval ?? 0;
  if (!(ci >= 0 && Number.isFinite(ci))) throw new CalcInputError(`confidenceInterval must be ≥ 0; got ${ci}.`, 'confidenceInterval');
  const excluded = new Uint8Array(HOUR_STATUSES.length);
  for (const s of opts.excludeStatuses ?? ['startup-shutdown']) {
    const code = (HourStatusCode as Record<string, number>)[s];
    if (code === undefined) throw new CalcInputError(`Unknown hour status "${s}" in excludeStatuses.`, 'excludeStatuses');
    excluded[code] = 1;
  }
  const cls = new Uint8Array(n);
  const v = new Float64Array(n);
  const m = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const st = series.status[i]!;
    const x = series.value[i]!;
    v[i] = NaN;
    m[i] = NaN;
    if (excluded[st]) cls[i] = HourClass.Excluded;
    else if (st === HourStatusCode['not-operating']) cls[i] = HourClass.NotOperating;
    else if (st === HourStatusCode.invalid || x !== x) cls[i] = HourClass.Invalid;
    else {
      // valid, substituted, or start-up/shut-down hours the rule keeps
      cls[i] = HourClass.Usable;
      m[i] = x;
      v[i] = x > ci ? x - ci : 0;
    }
  }
  return { cls, v, m };
}

/**
 * Validated value: the measured average minus the confidence interval, given as a percentage
 * of the ELV, with a floor of zero (IED 2010/75/EU Annex V Part 3 points 9–10 [pub]).
 *
 * @example
 * validatedAverage(95, 100, 20) //=> 75  (NOx: CI 20 % of ELV, IED Annex V Part 3 point 9)
 */
export function validatedAverage(value: number, elv: number, confidenceIntervalPercent: number): number {
  if (!(elv > 0)) throw new CalcInputError(`The ELV must be positive; got ${elv}.`, 'elv');
  if (!(confidenceIntervalPercent >= 0 && confidenceIntervalPercent <= 100)) {
    throw new CalcInputError(`confidenceIntervalPercent must be within 0–100; got ${confidenceIntervalPercent}.`, 'confidenceIntervalPercent');
  }
  if (!Number.isFinite(value)) throw new CalcInputError('The value to validate must be a number.', 'value');
  return Math.max(0, value - (confidenceIntervalPercent / 100) * elv);
}

interface Acc {
  valid: number;
  invalid: number;
  excluded: number;
  notOp: number;
  sumV: number;
  sumM: number;
}

function accumulate(p: PreparedHours, i0: number, i1: number): Acc {
  const a: Acc = { valid: 0, invalid: 0, excluded: 0, notOp: 0, sumV: 0, sumM: 0 };
  const { cls, v, m } = p;
  for (let i = i0; i < i1; i++) {
    const c = cls[i]!;
    if (c === HourClass.Usable) {
      a.valid++;
      a.sumV += v[i]!;
      a.sumM += m[i]!;
    } else if (c === HourClass.Invalid) a.invalid++;
    else if (c === HourClass.Excluded) a.excluded++;
    else a.notOp++;
  }
  return a;
}

/** First index i with t[i] ≥ x (t ascending). */
export function firstIndexAtOrAfter(t: Float64Array, x: number, lo = 0): number {
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (t[mid]! < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

function seriesSpan(series: HourlySeries, opts: AveragingOptions): { from: number; to: number; dataEnd: number } {
  const n = series.t.length;
  const lastEnd = n ? series.t[n - 1]! + series.periodMs : 0;
  const from = opts.from ?? (n ? series.t[0]! : 0);
  const to = opts.to ?? lastEnd;
  if (!(Number.isFinite(from) && Number.isFinite(to) && to >= from)) {
    throw new CalcInputError('The interval needs finite from ≤ to (UTC epoch ms).', 'interval');
  }
  return { from, to, dataEnd: opts.dataEnd ?? lastEnd };
}

function checkMinData(md: MinDataRule | undefined): void {
  if (!md) return;
  for (const [k, x] of Object.entries(md)) {
    if (x === undefined) continue;
    if (!(typeof x === 'number' && x >= 0 && Number.isFinite(x))) throw new CalcInputError(`minData.${k} must be a number ≥ 0; got ${String(x)}.`, `minData.${k}`);
  }
  if (md.minValidShare !== undefined && md.minValidShare > 1) throw new CalcInputError('minData.minValidShare is a share between 0 and 1.', 'minData.minValidShare');
}

/** Decides validity from accumulated counts; returns a note when invalid. */
function minDataFailure(a: Acc, md: MinDataRule | undefined, isDay: boolean): string | undefined {
  if (a.valid === 0) return 'no valid hours';
  if (!md) return undefined;
  if (isDay && md.maxInvalidHoursPerDay !== undefined && a.invalid > md.maxInvalidHoursPerDay) {
    return `${a.invalid} invalid hours (more than ${md.maxInvalidHoursPerDay} invalidate a day)`;
  }
  if (md.minValidHours !== undefined && a.valid < md.minValidHours) return `${a.valid} valid hours (at least ${md.minValidHours} needed)`;
  if (md.minValidShare !== undefined && a.valid / (a.valid + a.invalid) < md.minValidShare - 1e-12) {
    return `${((100 * a.valid) / (a.valid + a.invalid)).toFixed(1)} % of operating hours valid (at least ${(100 * md.minValidShare).toFixed(1)} % needed)`;
  }
  return undefined;
}

function periodValue(
  start: number,
  end: number,
  windowStart: number,
  a: Acc,
  totalHours: number,
  hourFrom: number,
  hourTo: number,
  failure: string | undefined,
  inProgress: string | undefined,
  invalidDays?: number,
  /** True when more data cannot cure the failure (a day already past its invalid-hour allowance). */
  failureIsFinal = false,
): PeriodValue {
  let status: PeriodStatus;
  let note: string | undefined;
  if (a.valid === 0 && a.invalid === 0 && !inProgress) status = 'not-operating';
  else if (inProgress && !(failure && failureIsFinal)) {
    status = 'incomplete';
    note = inProgress;
  } else if (failure) {
    status = 'invalid';
    note = failure;
  } else status = 'valid';
  return {
    start,
    end,
    windowStart,
    value: a.valid ? a.sumV / a.valid : null,
    measuredValue: a.valid ? a.sumM / a.valid : null,
    status,
    note,
    validHours: a.valid,
    invalidHours: a.invalid,
    excludedHours: a.excluded,
    notOperatingHours: a.notOp,
    totalHours,
    invalidDays,
    hourFrom,
    hourTo,
  };
}

/** Per local day: index range and counts. Used by the day rules, rolling windows and evaluation. */
export interface DayStats {
  readonly start: Float64Array;
  readonly end: Float64Array;
  readonly i0: Int32Array;
  readonly i1: Int32Array;
  readonly valid: Int32Array;
  readonly invalid: Int32Array;
  readonly excluded: Int32Array;
  readonly notOp: Int32Array;
  readonly sumV: Float64Array;
  readonly sumM: Float64Array;
}

/** Counts and sums of the prepared hours per local day over [from, to). */
export function dayStats(series: HourlySeries, p: PreparedHours, from: number, to: number, timeZone: string): DayStats {
  const b = localPeriodBoundaries(from, Math.max(to, from + 1), 'day', timeZone);
  const d = b.length - 1;
  const s: DayStats = {
    start: b.subarray(0, d),
    end: b.subarray(1),
    i0: new Int32Array(d),
    i1: new Int32Array(d),
    valid: new Int32Array(d),
    invalid: new Int32Array(d),
    excluded: new Int32Array(d),
    notOp: new Int32Array(d),
    sumV: new Float64Array(d),
    sumM: new Float64Array(d),
  };
  let i = firstIndexAtOrAfter(series.t, b[0]!);
  for (let k = 0; k < d; k++) {
    const e = b[k + 1]!;
    s.i0[k] = i;
    const { cls, v, m } = p;
    for (; i < series.t.length && series.t[i]! < e; i++) {
      const c = cls[i]!;
      if (c === HourClass.Usable) {
        s.valid[k]!++;
        s.sumV[k]! += v[i]!;
        s.sumM[k]! += m[i]!;
      } else if (c === HourClass.Invalid) s.invalid[k]!++;
      else if (c === HourClass.Excluded) s.excluded[k]!++;
      else s.notOp[k]!++;
    }
    s.i1[k] = i;
  }
  return s;
}

/**
 * Averages over calendar periods of the site's local calendar: hours, half-hours (for a
 * half-hourly series), days (23/24/25 hours), months (28–31 days) and years.
 *
 * A day with more invalid hours than `minData.maxInvalidHoursPerDay` is invalid (IED Annex V
 * Part 3 point 11); months and years report how many such days they hold.
 *
 * @example
 * periodAverages(series, { period: 'day', timeZone: 'Europe/Berlin', minData: { maxInvalidHoursPerDay: 3 } })
 */
export function periodAverages(series: HourlySeries, opts: AveragingOptions & { readonly period: CalendarPeriod }): PeriodValue[] {
  assertTimeZone(opts.timeZone);
  checkMinData(opts.minData);
  const { from, to, dataEnd } = seriesSpan(series, opts);
  const p = prepareHours(series, opts);
  const md = opts.minData;
  const out: PeriodValue[] = [];
  if (opts.period === 'hour' || opts.period === 'half-hour') {
    const want = opts.period === 'hour' ? 3_600_000 : 1_800_000;
    if (series.periodMs !== want) {
      throw new CalcInputError(`A ${opts.period} average needs a series of ${want / 60_000}-minute values; this one has ${series.periodMs / 60_000}-minute values.`, 'period');
    }
    for (let i = firstIndexAtOrAfter(series.t, from); i < series.t.length && series.t[i]! < to; i++) {
      const a = accumulate(p, i, i + 1);
      const end = series.t[i]! + series.periodMs;
      out.push(periodValue(series.t[i]!, end, series.t[i]!, a, 1, i, i + 1, minDataFailure(a, md, false), end > dataEnd ? 'hour in progress' : undefined));
    }
    return out;
  }
  const b = localPeriodBoundaries(from, to, opts.period, opts.timeZone);
  const days = opts.period !== 'day' && md?.maxInvalidHoursPerDay !== undefined ? dayStats(series, p, b[0]!, b[b.length - 1]!, opts.timeZone) : undefined;
  let i = firstIndexAtOrAfter(series.t, b[0]!);
  let dk = 0;
  for (let k = 0; k + 1 < b.length; k++) {
    const start = b[k]!;
    const end = b[k + 1]!;
    const i0 = i;
    i = firstIndexAtOrAfter(series.t, end, i);
    const a = accumulate(p, i0, i);
    let invalidDays: number | undefined;
    if (days) {
      invalidDays = 0;
      for (; dk < days.start.length && days.start[dk]! < end; dk++) if (days.invalid[dk]! > md!.maxInvalidHoursPerDay!) invalidDays++;
    } else if (opts.period === 'day' && md?.maxInvalidHoursPerDay !== undefined) {
      invalidDays = a.invalid > md.maxInvalidHoursPerDay ? 1 : 0;
    }
    const totalHours = (end - start) / series.periodMs;
    out.push(
      periodValue(
        start,
        end,
        start,
        a,
        totalHours,
        i0,
        i,
        minDataFailure(a, md, opts.period === 'day'),
        end > dataEnd ? `${opts.period} in progress` : undefined,
        invalidDays,
        opts.period === 'day' && md?.maxInvalidHoursPerDay !== undefined && a.invalid > md.maxInvalidHoursPerDay,
      ),
    );
  }
  return out;
}

/** A rolling window: N (operating) days, or N (operating) hours. */
export type RollingWindow =
  | { readonly kind: 'days'; readonly days: number; readonly operatingOnly?: boolean }
  | { readonly kind: 'hours'; readonly hours: number; readonly operatingOnly?: boolean };

/**
 * Rolling averages. For `days`, one value per (operating) day: the mean of all usable hourly
 * values in that day and the preceding N − 1 (operating) days — how 40 CFR 60 Subpart Da forms
 * its 30-boiler-operating-day rolling average (window of 30 successive boiler operating days,
 * recomputed each boiler operating day: §60.48Da(b) [pub: https://www.ecfr.gov/current/title-40/part-60/section-60.48Da];
 * mean of the hourly values [memory]); an operating day is a local day in which
 * the unit operated at any time. For `hours`, one value per (operating) hour over the last N
 * (operating) hours. `operatingOnly` defaults to true. Windows reach back before `from` when the
 * series holds earlier data; a window not yet full is `incomplete`.
 *
 * Minimum data: `minValidHours`, `minValidShare`, and for day windows `minValidHoursPerDay` on
 * `minValidDays` days (18 h on 22 of 30 days in 40 CFR 60 boiler rules [memory]; not a Method 19
 * figure — §12.7 covers compliance when the minimum is not met [pub: section title]).
 */
export function rollingAverages(series: HourlySeries, opts: AveragingOptions & { readonly window: RollingWindow }): PeriodValue[] {
  assertTimeZone(opts.timeZone);
  checkMinData(opts.minData);
  const w = opts.window;
  const size = w.kind === 'days' ? w.days : w.hours;
  if (!(Number.isInteger(size) && size >= 1)) throw new CalcInputError(`A rolling window needs a whole number ≥ 1 of ${w.kind}; got ${size}.`, 'window');
  const { from, to, dataEnd } = seriesSpan(series, opts);
  const p = prepareHours(series, opts);
  const md = opts.minData;
  const operatingOnly = w.operatingOnly ?? true;
  const out: PeriodValue[] = [];
  const n = series.t.length;
  if (n === 0) return out;
  if (w.kind === 'hours') {
    // Positions of the hours that count towards windows.
    const pos: number[] = [];
    for (let i = 0; i < n && series.t[i]! < to; i++) if (!operatingOnly || p.cls[i] !== HourClass.NotOperating) pos.push(i);
    for (let q = 0; q < pos.length; q++) {
      const i = pos[q]!;
      if (series.t[i]! < from) continue;
      const q0 = Math.max(0, q - size + 1);
      const a: Acc = { valid: 0, invalid: 0, excluded: 0, notOp: 0, sumV: 0, sumM: 0 };
      for (let r = q0; r <= q; r++) {
        const j = pos[r]!;
        const c = p.cls[j]!;
        if (c === HourClass.Usable) {
          a.valid++;
          a.sumV += p.v[j]!;
          a.sumM += p.m[j]!;
        } else if (c === HourClass.Invalid) a.invalid++;
        else if (c === HourClass.Excluded) a.excluded++;
        else a.notOp++;
      }
      const end = series.t[i]! + series.periodMs;
      const full = q - q0 + 1 === size;
      const inProgress = !full ? `window holds ${q - q0 + 1} of ${size} hours` : end > dataEnd ? 'hour in progress' : undefined;
      out.push(periodValue(series.t[i]!, end, series.t[pos[q0]!]!, a, size, pos[q0]!, i + 1, minDataFailure(a, md, false), inProgress));
    }
    return out;
  }
  const days = dayStats(series, p, Math.min(series.t[0]!, from), to, opts.timeZone);
  const cand: number[] = [];
  for (let k = 0; k < days.start.length; k++) {
    const operated = days.valid[k]! + days.invalid[k]! + days.excluded[k]! > 0;
    if (!operatingOnly || operated) cand.push(k);
  }
  for (let q = 0; q < cand.length; q++) {
    const k = cand[q]!;
    if (days.start[k]! < from || days.start[k]! >= to) continue;
    const q0 = Math.max(0, q - size + 1);
    const a: Acc = { valid: 0, invalid: 0, excluded: 0, notOp: 0, sumV: 0, sumM: 0 };
    let daysMeeting = 0;
    let totalHours = 0;
    for (let r = q0; r <= q; r++) {
      const d = cand[r]!;
      a.valid += days.valid[d]!;
      a.invalid += days.invalid[d]!;
      a.excluded += days.excluded[d]!;
      a.notOp += days.notOp[d]!;
      a.sumV += days.sumV[d]!;
      a.sumM += days.sumM[d]!;
      totalHours += (days.end[d]! - days.start[d]!) / series.periodMs;
      if (md?.minValidHoursPerDay === undefined || days.valid[d]! >= md.minValidHoursPerDay) daysMeeting++;
    }
    let failure = minDataFailure(a, md, false);
    if (!failure && md?.minValidDays !== undefined && daysMeeting < md.minValidDays) {
      failure = `${daysMeeting} days with at least ${md.minValidHoursPerDay ?? 1} valid hours (at least ${md.minValidDays} needed)`;
    }
    const full = q - q0 + 1 === size;
    const inProgress = !full ? `window holds ${q - q0 + 1} of ${size} ${operatingOnly ? 'operating ' : ''}days` : days.end[k]! > dataEnd ? 'day in progress' : undefined;
    const first = cand[q0]!;
    out.push(periodValue(days.start[k]!, days.end[k]!, days.start[first]!, a, totalHours, days.i0[first]!, days.i1[k]!, failure, inProgress));
  }
  return out;
}

/**
 * Block averages: consecutive N-hour blocks starting at local midnight (how several 40 CFR 60
 * subparts define 3-hour periods [memory]). Blocks never straddle days: when N does not divide a
 * day's hours (23 or 25 at DST changes), the day's last block is shorter; its `totalHours` says so.
 */
export function blockAverages(series: HourlySeries, opts: AveragingOptions & { readonly hours: number }): PeriodValue[] {
  assertTimeZone(opts.timeZone);
  checkMinData(opts.minData);
  const size = opts.hours;
  if (!(Number.isInteger(size) && size >= 1)) throw new CalcInputError(`A block needs a whole number ≥ 1 of hours; got ${size}.`, 'hours');
  const { from, to, dataEnd } = seriesSpan(series, opts);
  const p = prepareHours(series, opts);
  const days = localPeriodBoundaries(from, to, 'day', opts.timeZone);
  const out: PeriodValue[] = [];
  const blockMs = size * 3_600_000;
  let i = firstIndexAtOrAfter(series.t, days[0]!);
  for (let k = 0; k + 1 < days.length; k++) {
    const dayEnd = days[k + 1]!;
    for (let s = days[k]!; s < dayEnd; s += blockMs) {
      const e = Math.min(s + blockMs, dayEnd);
      if (e <= from || s >= to) {
        i = firstIndexAtOrAfter(series.t, e, i);
        continue;
      }
      const i0 = firstIndexAtOrAfter(series.t, s, i);
      i = firstIndexAtOrAfter(series.t, e, i0);
      const a = accumulate(p, i0, i);
      out.push(periodValue(s, e, s, a, (e - s) / series.periodMs, i0, i, minDataFailure(a, opts.minData, false), e > dataEnd ? 'block in progress' : undefined));
    }
  }
  return out;
}
