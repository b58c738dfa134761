/**
 * Timestamps written as text, in the formats data loggers and spreadsheets commonly produce:
 *
 *   2026-10-25 02:30[:00[.000]]   ISO 8601 date-time, also with `T`, and `2026/10/25 02:30`
 *   2026-10-25T00:30:00Z          ISO with `Z` or an offset (`+01:00`) — an exact instant, no zone needed
 *   25.10.2026 02:30              day first (the dotted form is always day.month.year)
 *   25/10/2026 02:30  10/25/2026 2:30 PM  25-10-2026 02:30   slashed or dashed with the year last:
 *                                 day-first or month-first, settled for the whole column (see
 *                                 `settleDayMonthOrder`), never cell by cell
 *   any of these without a time   midnight
 *
 * `24:00` (used by some loggers for the end of a day) means 00:00 of the next day.
 */
import { millisecondsInDay } from './local-time';

export type DayMonthOrder = 'day_first' | 'month_first';

export type TextTimestamp =
  /** Wall-clock time, to be placed in the site's zone. */
  | { kind: 'wall'; wallMs: number }
  /** An exact instant (the text carried `Z` or an offset). */
  | { kind: 'instant'; utcMs: number }
  /** Looks like a timestamp but is not a real date or time (e.g. 31.02.2026, 25:10). */
  | { kind: 'invalid'; reason: string };

const isoPattern =
  /^(\d{4})[-/](\d{1,2})[-/](\d{1,2})(?:[T ]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,6}))?)?)?\s*(Z|[+-]\d{2}(?::?\d{2})?)?$/i;
const dottedPattern = /^(\d{1,2})\.(\d{1,2})\.(\d{4})(?:[ T]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,6}))?)?)?$/;
const slashedPattern =
  /^(\d{1,2})([/-])(\d{1,2})\2(\d{4})(?:[ T]+(\d{1,2}):(\d{2})(?::(\d{2})(?:[.,](\d{1,6}))?)?\s*([AaPp][Mm])?)?$/;

function daysInMonth(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

function fractionToMs(fraction: string | undefined): number {
  if (!fraction) return 0;
  return Math.round(Number(`0.${fraction}`) * 1000);
}

function build(
  year: number,
  month: number,
  day: number,
  hour: number,
  minute: number,
  second: number,
  ms: number,
): { kind: 'wall'; wallMs: number } | { kind: 'invalid'; reason: string } {
  if (month < 1 || month > 12) return { kind: 'invalid', reason: `month ${month} does not exist` };
  if (day < 1 || day > daysInMonth(year, month)) return { kind: 'invalid', reason: `day ${day} does not exist in month ${month} of ${year}` };
  const endOfDay = hour === 24 && minute === 0 && second === 0 && ms === 0;
  if ((hour > 23 && !endOfDay) || minute > 59 || second > 59) {
    return { kind: 'invalid', reason: `time ${hour}:${String(minute).padStart(2, '0')} does not exist` };
  }
  if (endOfDay) return { kind: 'wall', wallMs: Date.UTC(year, month - 1, day) + millisecondsInDay };
  return { kind: 'wall', wallMs: Date.UTC(year, month - 1, day, hour, minute, second, ms) };
}

function offsetMinutes(text: string): number {
  if (text.toUpperCase() === 'Z') return 0;
  const sign = text.startsWith('-') ? -1 : 1;
  const digits = text.slice(1).replace(':', '');
  return sign * (Number(digits.slice(0, 2)) * 60 + Number(digits.slice(2, 4) || '0'));
}

/** For a slashed/dashed date with the year last: its two leading numbers, or null for other forms. */
export function leadingDayMonthPair(text: string): [number, number] | null {
  const m = slashedPattern.exec(text.trim());
  return m ? [Number(m[1]), Number(m[3])] : null;
}

/**
 * Parses one text timestamp. Returns null when the text does not look like a timestamp at all.
 *
 * @example
 * parseTextTimestamp('25.10.2026 02:30', 'day_first') //=> { kind: 'wall', wallMs: Date.UTC(2026, 9, 25, 2, 30) }
 * parseTextTimestamp('10/25/2026 2:30 PM', 'month_first') //=> { kind: 'wall', wallMs: Date.UTC(2026, 9, 25, 14, 30) }
 * parseTextTimestamp('2026-10-25T00:30:00Z', 'day_first') //=> { kind: 'instant', utcMs: Date.UTC(2026, 9, 25, 0, 30) }
 */
export function parseTextTimestamp(raw: string, order: DayMonthOrder): TextTimestamp | null {
  const text = raw.trim();
  let m = isoPattern.exec(text);
  if (m) {
    const wall = build(Number(m[1]), Number(m[2]), Number(m[3]), Number(m[4] ?? 0), Number(m[5] ?? 0), Number(m[6] ?? 0), fractionToMs(m[7]));
    if (wall.kind === 'invalid' || !m[8]) return wall;
    return { kind: 'instant', utcMs: wall.wallMs - offsetMinutes(m[8]) * 60_000 };
  }
  m = dottedPattern.exec(text);
  if (m) {
    return build(Number(m[3]), Number(m[2]), Number(m[1]), Number(m[4] ?? 0), Number(m[5] ?? 0), Number(m[6] ?? 0), fractionToMs(m[7]));
  }
  m = slashedPattern.exec(text);
  if (m) {
    const first = Number(m[1]);
    const second = Number(m[3]);
    const [day, month] = order === 'day_first' ? [first, second] : [second, first];
    let hour = Number(m[5] ?? 0);
    const meridiem = m[9]?.toUpperCase();
    if (meridiem) {
      if (hour < 1 || hour > 12) return { kind: 'invalid', reason: `hour ${hour} does not exist with ${meridiem}` };
      hour = (hour % 12) + (meridiem === 'PM' ? 12 : 0);
    }
    return build(Number(m[4]), month, day, hour, Number(m[6] ?? 0), Number(m[7] ?? 0), fractionToMs(m[8]));
  }
  return null;
}

export interface DayMonthDecision {
  order: DayMonthOrder;
  /**
   * `data`: some value's first number is above 12 (so it is a day) or its second is (so the first
   * is the month); `site`: nothing in the column settles it, so the site's country decided;
   * `contradictory`: the column holds both kinds — the caller reports it.
   */
  settledBy: 'data' | 'site' | 'contradictory';
}

/** Countries whose usual numeric date writes the month first (used only when the data cannot tell). */
const monthFirstCountries = new Set(['US', 'PH', 'FM', 'MH', 'PW', 'BZ', 'GU', 'PR', 'AS', 'VI', 'UM', 'MP']);

/**
 * Settles day-first vs month-first for a whole column of slashed/dashed dates. A month of data
 * always has days above 12, which settle it; a short file within the first 12 days of a month may
 * not, and then the site's country decides (and the preview says so).
 *
 * @example
 * settleDayMonthOrder(['01/10/2026 00:00', '25/10/2026 00:00'], 'US') //=> { order: 'day_first', settledBy: 'data' }
 * settleDayMonthOrder(['01/10/2026 00:00', '02/10/2026 00:00'], 'US') //=> { order: 'month_first', settledBy: 'site' }
 */
export function settleDayMonthOrder(texts: Iterable<string>, country: string | null): DayMonthDecision {
  let dayFirstEvidence = false;
  let monthFirstEvidence = false;
  for (const text of texts) {
    const pair = leadingDayMonthPair(text);
    if (!pair) continue;
    if (pair[0] > 12 && pair[1] <= 12) dayFirstEvidence = true;
    if (pair[1] > 12 && pair[0] <= 12) monthFirstEvidence = true;
  }
  if (dayFirstEvidence && monthFirstEvidence) return { order: 'day_first', settledBy: 'contradictory' };
  if (dayFirstEvidence) return { order: 'day_first', settledBy: 'data' };
  if (monthFirstEvidence) return { order: 'month_first', settledBy: 'data' };
  return { order: country && monthFirstCountries.has(country.toUpperCase()) ? 'month_first' : 'day_first', settledBy: 'site' };
}
