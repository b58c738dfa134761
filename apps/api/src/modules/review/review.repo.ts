/**
 * What the review reads of the stored hourly results, in one statement (one snapshot): per
 * channel and per limit a change marker of its stored hours (count, oldest and newest
 * `computed_at`, last hour) and, when asked, the hours themselves as one array per column
 * (`array_agg`), all in one JSON document that parses natively, with no object per hour on either
 * side. Hours are UTC hours, given as their offset from an origin hour so a caller can place them
 * on a regular grid.
 *
 * Writing the arrays as JSON is most of the statement's time (a few hundred nanoseconds an
 * entry; reading and aggregating the rows is a fraction of it), so only what varies travels in
 * full: the values. The hour offsets are left out when they are the plain run first, first + 1, …
 * (the common case), and statuses, reasons and coverages go as their exceptions (the hours not
 * valid, with a reason, not fully covered) with the offsets they belong to. `loadStoredHours`
 * returns the full columns.
 *
 * The markers decide whether stored limit hours are stale and make the review's entity tag.
 */
import { HOUR_REASONS, HOUR_STATUSES, millisecondsInHour } from '@flueledger/calc';
import type { Knex } from 'knex';
import { toDbWord } from '../results/channel-hours';
import type { ResultsScope } from '../results/stack-context';

const iso = (ms: number) => new Date(ms).toISOString();

/** Stored hour statuses in the order of the engine's `HourStatusCode`: index = code. */
export const HOUR_STATUS_LEGEND: readonly string[] = HOUR_STATUSES.map(toDbWord);
/** Stored hour reasons in the order of the engine's `HourReasonCode` (0 = none): index = code. */
export const HOUR_REASON_LEGEND: readonly string[] = HOUR_REASONS.map(toDbWord);

/** A status the legend does not know; the caller refuses it as the engine would. */
export const UNKNOWN_STATUS_CODE = -1;

/** Change marker of one channel's or limit's stored hours in the range read. */
export interface HoursMarker {
  /** Rows in the range read. */
  count: number;
  /** Rows in the review period proper (limits: without the look-back). */
  countInPeriod: number;
  /** Oldest and newest `computed_at` of the rows read, UTC ms. */
  oldest: number;
  newest: number;
  /** Start of the last stored hour, UTC ms. */
  last: number;
}

/** One channel's stored hours as parallel columns, sorted by hour. */
export interface StoredHourColumns {
  /** Hour offset from the origin of the query (hour start = origin + i · 1 h); negative before it. */
  i: number[];
  value: (number | null)[];
  /** Index in `HOUR_STATUS_LEGEND`, or `UNKNOWN_STATUS_CODE`. */
  status: number[];
  /** Index in `HOUR_REASON_LEGEND`; 0 (`none`) when there is none or the word is unknown. */
  reason: number[];
  /** Channels only (limits do not send theirs). */
  coverage?: (number | null)[];
  /** Limits only. */
  o2PercentDry?: (number | null)[];
  massKgPerHour?: (number | null)[];
}

export type StoredHours = HoursMarker & Partial<StoredHourColumns>;

export interface StoredHoursRead {
  channels: Map<string, StoredHours>;
  limits: Map<string, StoredHours>;
}

/** The range of stored hours a limit's review reads: its own period plus its look-back. */
export interface LimitHourRange {
  limitId: string;
  /** UTC ms, inclusive (the period's first hour minus the look-back). */
  fromMs: number;
}

export interface StoredHoursQuery {
  channelIds: readonly string[];
  limitRanges: readonly LimitHourRange[];
  /** The review period's whole hours, UTC ms; offsets count from `fromMs`. */
  fromMs: number;
  toMs: number;
  /** false: markers only (aggregates; no hour leaves the database). */
  columns: boolean;
  /** Also the limits' O2 and mass-rate columns (how each hour was derived). */
  derivation?: boolean;
}

/** Bindings holding arrays (node-postgres sends them as SQL arrays). */
const bindings = (values: unknown[]): Knex.RawBinding[] => values as Knex.RawBinding[];

const markerFields = `'count', count(*), 'oldest', date_part('epoch', min(computed_at)) * 1000,
  'newest', date_part('epoch', max(computed_at)) * 1000, 'last', date_part('epoch', max(hour_start)) * 1000`;
// Per row, in the ordered subquery: the hour's offset, status code and reason code.
const hourOffset = `((date_part('epoch', hour_start)::bigint * 1000 - ?::bigint) / ${millisecondsInHour})::int as off`;
const statusCode = `coalesce(array_position(?::text[], status) - 1, ${UNKNOWN_STATUS_CODE}) as code`;
// No reason, or a word the legend does not know, is code 0 ('none'), as the engine reads it.
const reasonCode = 'coalesce(array_position(?::text[], reason) - 1, 0) as rcode';
/**
 * The offsets (null when they are exactly first, first + 1, … in the order of the other arrays:
 * compared in the database, where it costs next to nothing), the values, and the exceptions of
 * status (code 0 is `valid`) and reason (0 is `none`).
 */
const commonColumns = `'first', min(off),
  'i', case when array_agg(off) = array(select generate_series(min(off), max(off))) then null else array_agg(off) end,
  'value', array_agg(value),
  'statusAt', array_agg(off) filter (where code <> 0), 'status', array_agg(code) filter (where code <> 0),
  'reasonAt', array_agg(off) filter (where rcode <> 0), 'reason', array_agg(rcode) filter (where rcode <> 0)`;

/** One channel's or limit's hours as the statement sends them (see the file header). */
interface SentHours extends HoursMarker {
  first?: number;
  i?: number[] | null;
  value?: (number | null)[];
  statusAt?: number[] | null;
  status?: number[] | null;
  reasonAt?: number[] | null;
  reason?: number[] | null;
  coverageAt?: number[] | null;
  coverage?: (number | null)[] | null;
  o2PercentDry?: (number | null)[];
  massKgPerHour?: (number | null)[];
}

/**
 * Markers and, when asked, columns of the channels' hours in the period and of each limit's hours in its range.
 *
 * Each channel and each limit is read by its own range of the primary key (tenant, channel or
 * limit, hour) through a lateral join: the work follows the stack's hours, not the organisation's
 * (a filter on `channel_id = any(…)` would walk every channel of the organisation in the period),
 * and the rows come in hour order.
 */
export async function loadStoredHours(scope: ResultsScope, q: StoredHoursQuery): Promise<StoredHoursRead> {
  const statuses = [...HOUR_STATUS_LEGEND];
  const reasons = [...HOUR_REASON_LEGEND];
  const rowCodes = q.columns ? `, ${hourOffset}, ${statusCode}, ${reasonCode}` : '';
  const channelColumns = q.columns
    ? `, ${commonColumns},
       'coverageAt', array_agg(off) filter (where coverage is distinct from 1), 'coverage', array_agg(coverage) filter (where coverage is distinct from 1)`
    : '';
  const limitColumns = q.columns
    ? `, ${commonColumns}` + (q.derivation ? `, 'o2PercentDry', array_agg(o2_percent_dry), 'massKgPerHour', array_agg(mass_kg_per_hour)` : '')
    : '';
  const codeBindings = q.columns ? [q.fromMs, statuses, reasons] : [];
  const { rows } = await scope.db.raw(
    `select
       (select coalesce(json_object_agg(c.id, h.hours), '{}')::text
          from unnest(?::uuid[]) as c(id)
          cross join lateral (
            select json_build_object(${markerFields}, 'countInPeriod', count(*)${channelColumns}) as hours
              from (select hour_start, computed_at, value, coverage${rowCodes}
                      from hourly_values
                     where tenant_id = ? and channel_id = c.id and hour_start >= ? and hour_start < ?
                     order by hour_start) v
            having count(*) > 0) h) as channels,
       (select coalesce(json_object_agg(r.limit_id, h.hours), '{}')::text
          from unnest(?::uuid[], ?::timestamptz[]) as r(limit_id, from_t)
          cross join lateral (
            select json_build_object(${markerFields}, 'countInPeriod', count(*) filter (where hour_start >= ?)${limitColumns}) as hours
              from (select hour_start, computed_at, value, o2_percent_dry, mass_kg_per_hour${rowCodes}
                      from limit_hourly_values
                     where tenant_id = ? and limit_id = r.limit_id and hour_start >= r.from_t
                       and hour_start >= ? and hour_start < ?
                     order by hour_start) v
            having count(*) > 0) h) as limits`,
    bindings([
      [...q.channelIds],
      ...codeBindings,
      scope.tenantId,
      iso(q.fromMs),
      iso(q.toMs),
      q.limitRanges.map((r) => r.limitId),
      q.limitRanges.map((r) => iso(r.fromMs)),
      iso(q.fromMs),
      ...codeBindings,
      scope.tenantId,
      // The earliest hour any limit reads, stated as a constant so the planner skips older partitions.
      iso(Math.min(q.fromMs, ...q.limitRanges.map((r) => r.fromMs))),
      iso(q.toMs),
    ]),
  );
  const row = rows[0] as { channels: string; limits: string };
  const read = (text: string) => {
    const out = new Map<string, StoredHours>();
    for (const [id, hours] of Object.entries(JSON.parse(text) as Record<string, SentHours>)) out.set(id, q.columns ? sortedByHour(fullColumns(hours)) : markersOf(hours));
    return out;
  };
  return { channels: read(row.channels), limits: read(row.limits) };
}

const markersOf = ({ count, countInPeriod, oldest, newest, last }: SentHours): StoredHours => ({ count, countInPeriod, oldest, newest, last });

/** The full columns of one channel's or limit's hours from what the statement sent. */
function fullColumns(sent: SentHours): StoredHours {
  const { first = 0, i: sentOffsets, statusAt, status, reasonAt, reason, coverageAt, coverage, ...rest } = sent;
  const n = sent.value?.length ?? 0;
  let i: number[];
  let indexOf: (offset: number) => number;
  if (sentOffsets) {
    i = sentOffsets;
    const position = new Map(i.map((offset, k) => [offset, k]));
    indexOf = (offset) => position.get(offset)!;
  } else {
    i = new Array<number>(n);
    for (let k = 0; k < n; k++) i[k] = first + k;
    indexOf = (offset) => offset - first;
  }
  function column<T>(offsets: readonly number[] | null | undefined, values: readonly T[] | null | undefined, usual: T): T[] {
    const out = new Array<T>(n).fill(usual);
    if (offsets && values) for (let e = 0; e < offsets.length; e++) out[indexOf(offsets[e]!)] = values[e]!;
    return out;
  }
  const full: StoredHours = { ...rest, i, status: column(statusAt, status, 0), reason: column(reasonAt, reason, 0) };
  // Only channels send coverages; a channel with no exception sends `coverageAt` as null.
  if ('coverageAt' in sent) full.coverage = column<number | null>(coverageAt, coverage, 1);
  return full;
}

const columnNames = ['i', 'value', 'status', 'reason', 'coverage', 'o2PercentDry', 'massKgPerHour'] as const;

/**
 * The hours in ascending order: as they came (one pass to check; an aggregate over an ordered
 * subquery keeps its order in practice, though SQL does not promise it), else sorted.
 */
function sortedByHour(hours: StoredHours): StoredHours {
  const i = hours.i ?? [];
  let ascending = true;
  for (let k = 1; k < i.length && ascending; k++) ascending = i[k - 1]! < i[k]!;
  if (ascending) return hours;
  const order = i.map((_, k) => k).sort((a, b) => i[a]! - i[b]!);
  const sorted: StoredHours = { ...hours };
  for (const name of columnNames) {
    const column = hours[name] as unknown[] | undefined;
    if (column) (sorted as unknown as Record<string, unknown>)[name] = order.map((k) => column[k]);
  }
  return sorted;
}
