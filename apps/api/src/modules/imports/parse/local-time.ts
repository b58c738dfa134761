/**
 * Wall-clock times → UTC instants, in the site's IANA time zone, without guessing.
 *
 * A data logger writes local wall-clock times ("2026-10-25 02:30"). Around a daylight-saving
 * change such a time may not exist (spring: the clock jumps from 02:00 to 03:00) or may exist twice
 * (autumn: 02:00–02:59 happens once in summer time and once in winter time). `localToUtc` says which
 * of the three cases applies; the caller reports the first two instead of picking an answer.
 *
 * Wall-clock times are carried as "wall milliseconds": the number of milliseconds the wall clock
 * shows since 1970-01-01 00:00 on the same clock (i.e. `Date.UTC(y, m, d, h, mi, s)`), which has no
 * time zone of its own.
 */
import { tzOffset } from '@date-fns/tz';

export const millisecondsInSecond = 1000;
export const millisecondsInMinute = 60 * millisecondsInSecond;
export const millisecondsInHour = 60 * millisecondsInMinute;
export const millisecondsInDay = 24 * millisecondsInHour;

export type LocalTimeResult =
  | { kind: 'unique'; utcMs: number; offsetMinutes: number }
  /** The wall clock shows this time twice; `earlierUtcMs` is the first (summer-time) occurrence. */
  | { kind: 'ambiguous'; earlierUtcMs: number; laterUtcMs: number }
  /** The wall clock skips this time (spring-forward gap). */
  | { kind: 'missing' };

/**
 * Converts wall-clock times of one time zone to UTC. Keeps a cache per wall-clock hour, because a
 * month of one-minute data asks about the same few hundred hours tens of thousands of times and
 * each offset look-up goes through Intl.
 */
export class LocalTimeConverter {
  private readonly steadyHours = new Map<number, number | null>();

  constructor(readonly timeZone: string) {
    if (Number.isNaN(tzOffset(timeZone, new Date(0)))) throw new Error(`Unknown time zone ${timeZone}`);
  }

  /**
   * @example
   * new LocalTimeConverter('Europe/Berlin').toUtc(Date.UTC(2026, 9, 25, 2, 30))
   * //=> { kind: 'ambiguous', earlierUtcMs: Date.UTC(2026, 9, 25, 0, 30), laterUtcMs: Date.UTC(2026, 9, 25, 1, 30) }
   */
  toUtc(wallMs: number): LocalTimeResult {
    const hourKey = Math.floor(wallMs / millisecondsInHour);
    let steady = this.steadyHours.get(hourKey);
    if (steady === undefined) {
      // If the offset a day before equals the offset a day after, no change happens in between
      // (zones change at most twice a year, never twice within two days).
      const before = this.offset(hourKey * millisecondsInHour - millisecondsInDay);
      const after = this.offset((hourKey + 1) * millisecondsInHour + millisecondsInDay);
      steady = before === after ? before : null;
      this.steadyHours.set(hourKey, steady);
    }
    if (steady !== null) return { kind: 'unique', utcMs: wallMs - steady * millisecondsInMinute, offsetMinutes: steady };
    return this.resolveNearChange(wallMs);
  }

  private offset(approxUtcMs: number): number {
    return tzOffset(this.timeZone, new Date(approxUtcMs));
  }

  private resolveNearChange(wallMs: number): LocalTimeResult {
    const candidateOffsets = new Set([this.offset(wallMs - millisecondsInDay), this.offset(wallMs + millisecondsInDay)]);
    const matches: { utcMs: number; offsetMinutes: number }[] = [];
    for (const offsetMinutes of candidateOffsets) {
      const utcMs = wallMs - offsetMinutes * millisecondsInMinute;
      // A candidate is real when the zone, at that instant, really shows this offset.
      if (this.offset(utcMs) === offsetMinutes) matches.push({ utcMs, offsetMinutes });
    }
    if (matches.length === 0) return { kind: 'missing' };
    if (matches.length === 1) return { kind: 'unique', ...matches[0]! };
    matches.sort((a, b) => a.utcMs - b.utcMs);
    return { kind: 'ambiguous', earlierUtcMs: matches[0]!.utcMs, laterUtcMs: matches[1]!.utcMs };
  }
}

/** Formats wall milliseconds as `YYYY-MM-DD HH:mm[:ss]` (for messages). */
export function formatWall(wallMs: number): string {
  const iso = new Date(wallMs).toISOString();
  const seconds = iso.slice(17, 19);
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)}${seconds === '00' ? '' : `:${seconds}`}`;
}

/**
 * Excel's day 1 in the 1900 date system is 1900-01-01, and Excel (copying Lotus 1-2-3) counts a
 * 29 February 1900 that never happened as day 60. So from day 61 (1900-03-01) on, day n is
 * 1899-12-30 + n days; below 60 it is 1899-12-31 + n days; day 60 is no real date.
 * In the 1904 date system (old Mac workbooks, flag `date1904` in workbook.xml) day 0 is 1904-01-01.
 * Source: ECMA-376 Part 1, §18.17.4.1 "Date Conversion for Serial Date-Times" (1900 and 1904 bases,
 * and the 1900 leap-year quirk).
 */
const excel1900Day61WallMs = Date.UTC(1899, 11, 30);
const excel1900BeforeDay60WallMs = Date.UTC(1899, 11, 31);
const excel1904Day0WallMs = Date.UTC(1904, 0, 1);

/**
 * Converts an Excel serial date-time to wall milliseconds, rounded to the nearest second (serials
 * are binary fractions of a day: 10:01 is 0.417361111…, never exact). Returns null for day 60 of the
 * 1900 system (the non-existent 29 February 1900) and for negative serials.
 *
 * @example
 * excelSerialToWallMs(46320.5) //=> Date.UTC(2026, 9, 25, 12, 0)
 * excelSerialToWallMs(60)      //=> null
 */
export function excelSerialToWallMs(serial: number, date1904 = false): number | null {
  if (!Number.isFinite(serial) || serial < 0) return null;
  let baseMs: number;
  if (date1904) baseMs = excel1904Day0WallMs;
  else if (serial >= 61) baseMs = excel1900Day61WallMs;
  else if (serial >= 60) return null;
  else baseMs = excel1900BeforeDay60WallMs;
  const ms = baseMs + serial * millisecondsInDay;
  return Math.round(ms / millisecondsInSecond) * millisecondsInSecond;
}

/** The inverse of excelSerialToWallMs for the 1900 system (days ≥ 61), used when writing workbooks. */
export function wallMsToExcelSerial(wallMs: number): number {
  return (wallMs - excel1900Day61WallMs) / millisecondsInDay;
}
