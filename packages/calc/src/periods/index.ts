/**
 * Averaging periods in the site's local calendar. A site has an IANA time zone; its days run
 * from local midnight to local midnight, so a day has 23 or 25 hours at a DST change, and months
 * and years follow the local calendar too. Timestamps stay UTC epoch ms.
 */
import { TZDate } from '@date-fns/tz';
import { CalcInputError } from '../errors';

/** Calendar averaging periods. */
export type CalendarPeriod = 'hour' | 'half-hour' | 'day' | 'month' | 'year';

const fixedMs: Partial<Record<CalendarPeriod, number>> = { hour: 3_600_000, 'half-hour': 1_800_000 };
const millisecondsInDay = 86_400_000;
const knownZones = new Set<string>(['UTC']);

/** Throws a CalcInputError unless `timeZone` is an IANA zone name the runtime knows. */
export function assertTimeZone(timeZone: string): void {
  if (knownZones.has(timeZone)) return;
  let ok = false;
  try {
    ok = typeof timeZone === 'string' && timeZone.length > 0 && !Number.isNaN(new TZDate(0, timeZone).getTime());
    if (ok) new Intl.DateTimeFormat('en', { timeZone });
  } catch {
    ok = false;
  }
  if (!ok) throw new CalcInputError(`"${String(timeZone)}" is not an IANA time zone (e.g. Europe/Berlin).`, 'timeZone');
  knownZones.add(timeZone);
}

const offsetFormats = new Map<string, Intl.DateTimeFormat>();

/**
 * UTC offset of the zone at instant t, in ms (positive east of Greenwich), from the runtime's tz
 * database — the same source `@date-fns/tz` reads (its `tzOffset`), with the formatter kept per
 * zone because this runs once per day of every evaluated year.
 */
function offsetMs(timeZone: string, t: number): number {
  let f = offsetFormats.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', { timeZone, timeZoneName: 'longOffset' });
    offsetFormats.set(timeZone, f);
  }
  // e.g. "1/1/2026, GMT+01:00"; "GMT" alone for UTC.
  const s = f.format(t);
  const g = s.lastIndexOf('GMT');
  if (g < 0 || g + 3 >= s.length) return 0;
  const sign = s.charCodeAt(g + 3) === 45 /* - */ || s.charCodeAt(g + 3) === 0x2212 ? -1 : 1;
  const h = Number(s.slice(g + 4, g + 6));
  const m = s.length >= g + 9 ? Number(s.slice(g + 7, g + 9)) : 0;
  return sign * (h * 60 + m) * 60_000;
}

/**
 * The UTC instant of local midnight on the local calendar date whose UTC-midnight timestamp is
 * `dateUtc` (i.e. Date.UTC(y, m, d)). `hintMs` is a likely offset (the previous day's) that saves
 * a look-up. When midnight falls into a DST gap, the day starts at the transition.
 */
function localMidnight(dateUtc: number, timeZone: string, hintMs?: number): number {
  const o0 = hintMs ?? offsetMs(timeZone, dateUtc);
  const t1 = dateUtc - o0;
  const o1 = offsetMs(timeZone, t1);
  if (o1 === o0) return t1;
  const t2 = dateUtc - o1;
  const o2 = offsetMs(timeZone, t2);
  if (o2 === o1) return t2;
  return Math.max(t1, t2);
}

/** Local calendar date of instant t, as the UTC-midnight timestamp of that date. */
function localDate(t: number, timeZone: string): number {
  const local = t + offsetMs(timeZone, t);
  return Math.floor(local / millisecondsInDay) * millisecondsInDay;
}

/**
 * Start (UTC ms) of the local calendar period that contains `t`.
 *
 * @example
 * // 2026-03-29 12:00 UTC in Berlin: the day starts at 2026-03-28T23:00Z (CET, UTC+1)
 * startOfLocalPeriod(Date.UTC(2026, 2, 29, 12), 'day', 'Europe/Berlin') //=> Date.UTC(2026, 2, 28, 23)
 */
export function startOfLocalPeriod(t: number, period: CalendarPeriod, timeZone: string): number {
  const fixed = fixedMs[period];
  // Hours and half-hours: UTC multiples, which match local clock hours in every zone with a
  // whole-hour (or half-hour, for half-hours) offset.
  if (fixed) return Math.floor(t / fixed) * fixed;
  const date = localDate(t, timeZone);
  let start: number;
  if (period === 'day') start = localMidnight(date, timeZone);
  else {
    const d = new Date(date);
    start = localMidnight(period === 'month' ? Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), 1) : Date.UTC(d.getUTCFullYear(), 0, 1), timeZone);
  }
  // A day that starts after a DST gap at midnight: t may lie before the computed start only if
  // t is in the previous local day.
  return start <= t ? start : startOfLocalPeriod(start - 1, period, timeZone);
}

/** Start (UTC ms) of the local period following the one that starts at `start`. */
export function nextLocalPeriodStart(start: number, period: CalendarPeriod, timeZone: string): number {
  const fixed = fixedMs[period];
  if (fixed) return start + fixed;
  const o = offsetMs(timeZone, start);
  const d = new Date(Math.floor((start + o) / millisecondsInDay) * millisecondsInDay);
  const y = d.getUTCFullYear();
  const m = d.getUTCMonth();
  const next = period === 'day' ? Date.UTC(y, m, d.getUTCDate() + 1) : period === 'month' ? Date.UTC(y, m + 1, 1) : Date.UTC(y + 1, 0, 1);
  return localMidnight(next, timeZone, o);
}

const boundaryCache = new Map<string, Float64Array>();
const boundaryCacheSize = 32;

/**
 * Boundaries of the local periods that overlap [from, to): b[0] ≤ from is the start of the
 * first period, each b[k+1] the end of period k, and the last boundary is ≥ to.
 *
 * @example
 * localPeriodBoundaries(Date.UTC(2024, 1, 1), Date.UTC(2024, 2, 1), 'month', 'UTC').length //=> 2
 */
export function localPeriodBoundaries(from: number, to: number, period: CalendarPeriod, timeZone: string): Float64Array {
  assertTimeZone(timeZone);
  if (!(Number.isFinite(from) && Number.isFinite(to)) || to < from) {
    throw new CalcInputError('The interval needs finite from ≤ to (UTC epoch ms).', 'interval');
  }
  // Memoised: the same days and months are asked for by every rule of an evaluation. The result
  // depends on its arguments only, so caching keeps the function pure; callers must not mutate it.
  const key = `${timeZone}|${period}|${from}|${to}`;
  const hit = boundaryCache.get(key);
  if (hit) return hit;
  const out: number[] = [startOfLocalPeriod(from, period, timeZone)];
  while (out[out.length - 1]! < to) out.push(nextLocalPeriodStart(out[out.length - 1]!, period, timeZone));
  if (out.length === 1) out.push(nextLocalPeriodStart(out[0]!, period, timeZone));
  const result = Float64Array.from(out);
  if (boundaryCache.size >= boundaryCacheSize) boundaryCache.delete(boundaryCache.keys().next().value!);
  boundaryCache.set(key, result);
  return result;
}

/**
 * Length in hours of the local day containing `t` (23 or 25 at a DST change, else 24).
 *
 * @example
 * hoursInLocalDay(Date.UTC(2026, 9, 25, 12), 'Europe/Berlin') //=> 25
 */
export function hoursInLocalDay(t: number, timeZone: string): number {
  const start = startOfLocalPeriod(t, 'day', timeZone);
  return (nextLocalPeriodStart(start, 'day', timeZone) - start) / 3_600_000;
}
