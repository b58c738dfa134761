/*
 * Instants are stored and sent in UTC; people read them in the site's own time zone (IANA name),
 * and months and days follow that zone's calendar, DST included (DESIGN.md §4). Intl does the
 * zone arithmetic, so no time-zone database ships with the app.
 */

const partsFormatters = new Map<string, Intl.DateTimeFormat>();

function partsFormatter(timeZone: string): Intl.DateTimeFormat {
  let formatter = partsFormatters.get(timeZone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-GB', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    partsFormatters.set(timeZone, formatter);
  }
  return formatter;
}

interface WallClock {
  year: number;
  month: number;
  day: number;
  hour: number;
  minute: number;
  second: number;
}

/** The wall-clock reading in `timeZone` at the instant `epochMs`. */
export function wallClock(epochMs: number, timeZone: string): WallClock {
  const parts = Object.fromEntries(
    partsFormatter(timeZone)
      .formatToParts(new Date(epochMs))
      .filter((part) => part.type !== 'literal')
      .map((part) => [part.type, Number(part.value)]),
  ) as Record<string, number>;
  return { year: parts['year'], month: parts['month'], day: parts['day'], hour: parts['hour'], minute: parts['minute'], second: parts['second'] };
}

/** How far `timeZone` is ahead of UTC at `epochMs`, in milliseconds (+3 600 000 for CET in winter). */
export function zoneOffsetMs(epochMs: number, timeZone: string): number {
  const clock = wallClock(epochMs, timeZone);
  const asUtc = Date.UTC(clock.year, clock.month - 1, clock.day, clock.hour, clock.minute, clock.second);
  return asUtc - Math.floor(epochMs / 1000) * 1000;
}

/**
 * The instant local midnight starts the given day in `timeZone`. Midnight itself is never
 * skipped by the DST rules of the sites we serve; if it were, the first existing instant wins.
 * @example zonedMidnight(2026, 11, 1, 'Europe/Berlin') //=> 2026-10-31T23:00:00.000Z
 */
export function zonedMidnight(year: number, month: number, day: number, timeZone: string): Date {
  const guess = Date.UTC(year, month - 1, day);
  let instant = guess - zoneOffsetMs(guess, timeZone);
  // A second pass settles the offset when the guess and the answer lie on different sides of a DST change.
  instant = guess - zoneOffsetMs(instant, timeZone);
  return new Date(instant);
}

/** "2026-11" */
export type MonthKey = string;

export function isMonthKey(value: unknown): value is MonthKey {
  return typeof value === 'string' && /^\d{4}-(0[1-9]|1[0-2])$/.test(value);
}

/** The month of the site's calendar as UTC instants: from (inclusive) and to (exclusive). */
export function zonedMonthRange(month: MonthKey, timeZone: string): { from: Date; to: Date } {
  const [year, monthNumber] = month.split('-').map(Number);
  const next = monthNumber === 12 ? [year + 1, 1] : [year, monthNumber + 1];
  return { from: zonedMidnight(year, monthNumber, 1, timeZone), to: zonedMidnight(next[0], next[1], 1, timeZone) };
}

/** The month of the site's calendar an instant falls in. */
export function monthKeyOf(instant: string | number | Date, timeZone: string): MonthKey {
  const clock = wallClock(new Date(instant).getTime(), timeZone);
  return `${clock.year}-${String(clock.month).padStart(2, '0')}`;
}

/** The month before (delta −1) or after (+1). */
export function shiftMonth(month: MonthKey, delta: number): MonthKey {
  const [year, monthNumber] = month.split('-').map(Number);
  const index = year * 12 + (monthNumber - 1) + delta;
  return `${Math.floor(index / 12)}-${String((index % 12) + 1).padStart(2, '0')}`;
}

/** "November 2026" */
export function monthLabel(month: MonthKey): string {
  const [year, monthNumber] = month.split('-').map(Number);
  return new Intl.DateTimeFormat('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(Date.UTC(year, monthNumber - 1, 1));
}

const displayFormatters = new Map<string, Intl.DateTimeFormat>();
const dateFormatters = new Map<string, Intl.DateTimeFormat>();

/** The site's calendar day holding an instant, e.g. "31 Oct 2026". */
export function formatZonedDate(instant: string | number | Date | null | undefined, timeZone: string | null | undefined): string {
  if (instant === null || instant === undefined || instant === '') return '—';
  const zone = timeZone || 'UTC';
  let formatter = dateFormatters.get(zone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-GB', { timeZone: zone, day: 'numeric', month: 'short', year: 'numeric' });
    dateFormatters.set(zone, formatter);
  }
  return formatter.format(new Date(instant));
}
const zoneNameFormatters = new Map<string, Intl.DateTimeFormat>();

/**
 * The zone's short name at an instant ("CET", "CEST", "MST", "MDT"), else its offset ("GMT+8").
 * British English names the European zones and only offsets elsewhere; American English names the
 * North American zones and only offsets elsewhere: the first that gives a name wins.
 */
export function zoneShortName(instant: number, timeZone: string): string {
  let offsetName = '';
  for (const locale of ['en-GB', 'en-US']) {
    const key = `${locale}|${timeZone}`;
    let formatter = zoneNameFormatters.get(key);
    if (!formatter) {
      formatter = new Intl.DateTimeFormat(locale, { timeZone, timeZoneName: 'short' });
      zoneNameFormatters.set(key, formatter);
    }
    const name = formatter.formatToParts(instant).find((part) => part.type === 'timeZoneName')?.value ?? '';
    if (name && !/^(GMT|UTC)[+-]/.test(name)) return name;
    offsetName ||= name;
  }
  return offsetName || timeZone;
}

/**
 * An instant as the site reads it, e.g. "1 Nov 2026, 14:00 CET". The zone's short name is shown
 * so the hour repeated at the end of summer time stays unambiguous.
 */
export function formatZoned(instant: string | number | Date | null | undefined, timeZone: string | null | undefined, withSeconds = false): string {
  if (instant === null || instant === undefined || instant === '') return '—';
  const zone = timeZone || 'UTC';
  const key = `${zone}|${withSeconds}`;
  let formatter = displayFormatters.get(key);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-GB', {
      timeZone: zone,
      day: 'numeric',
      month: 'short',
      year: 'numeric',
      hour: '2-digit',
      minute: '2-digit',
      ...(withSeconds ? { second: '2-digit' } : {}),
      hourCycle: 'h23',
    });
    displayFormatters.set(key, formatter);
  }
  const ms = new Date(instant).getTime();
  return `${formatter.format(ms)} ${zoneShortName(ms, zone)}`;
}
