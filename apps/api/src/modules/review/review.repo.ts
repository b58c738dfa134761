/**
 * What the review reads of the stored hourly results, in one statement (one snapshot): per
 * channel and per limit a change marker of its stored hours (count, oldest and newest
 * `computed_at`, last hour) and, when asked, the hours themselves as one array per column
 * (`array_agg`), all in one JSON document that parses natively, with no object per hour on either
 * side. Hours are UTC hours, given as their offset from an origin hour so a caller can place them
 * on a regular grid.
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
// Arrays without ORDER BY: the aggregates of one group see its rows in one and the same order, so
// the columns line up; `i` says where each entry belongs and the caller sorts if it must (rows
// arrive in index order in practice, and one sort per aggregate would double the query's time).
const hourOffset = `((date_part('epoch', hour_start)::bigint * 1000 - ?::bigint) / ${millisecondsInHour})::int`;
const statusCode = `coalesce(array_position(?::text[], status) - 1, ${UNKNOWN_STATUS_CODE})`;
// No reason, or a word the legend does not know, is code 0 ('none'), as the engine reads it.
const reasonCode = 'coalesce(array_position(?::text[], reason) - 1, 0)';

/** Markers and, when asked, columns of the channels' hours in the period and of each limit's hours in its range. */
export async function loadStoredHours(scope: ResultsScope, q: StoredHoursQuery): Promise<StoredHoursRead> {
  const statuses = [...HOUR_STATUS_LEGEND];
  const reasons = [...HOUR_REASON_LEGEND];
  const channelColumns = q.columns
    ? `, 'i', array_agg(${hourOffset}), 'value', array_agg(value), 'status', array_agg(${statusCode}),
         'reason', array_agg(${reasonCode}), 'coverage', array_agg(coverage)`
    : '';
  const limitColumns = q.columns
    ? `, 'i', array_agg(${hourOffset}), 'value', array_agg(value), 'status', array_agg(${statusCode}), 'reason', array_agg(${reasonCode})` +
      (q.derivation ? `, 'o2PercentDry', array_agg(o2_percent_dry), 'massKgPerHour', array_agg(mass_kg_per_hour)` : '')
    : '';
  const columnBindings = q.columns ? [q.fromMs, statuses, reasons] : [];
  const { rows } = await scope.db.raw(
    `select
       (select coalesce(json_object_agg(x.id, x.hours), '{}')::text from (
          select channel_id as id, json_build_object(${markerFields}, 'countInPeriod', count(*)${channelColumns}) as hours
            from hourly_values
           where tenant_id = ? and channel_id = any(?::uuid[]) and hour_start >= ? and hour_start < ?
           group by channel_id) x) as channels,
       (select coalesce(json_object_agg(y.id, y.hours), '{}')::text from (
          select v.limit_id as id,
                 json_build_object(${markerFields}, 'countInPeriod', count(*) filter (where hour_start >= ?)${limitColumns}) as hours
            from unnest(?::uuid[], ?::timestamptz[]) as q(limit_id, from_t)
            join limit_hourly_values v on v.tenant_id = ? and v.limit_id = q.limit_id and v.hour_start >= q.from_t
                                       and v.hour_start >= ? and v.hour_start < ?
           group by v.limit_id) y) as limits`,
    bindings([
      ...columnBindings,
      scope.tenantId,
      [...q.channelIds],
      iso(q.fromMs),
      iso(q.toMs),
      iso(q.fromMs),
      ...columnBindings,
      q.limitRanges.map((r) => r.limitId),
      q.limitRanges.map((r) => iso(r.fromMs)),
      scope.tenantId,
      // The earliest hour any limit reads, stated as a constant so the planner skips older partitions.
      iso(Math.min(q.fromMs, ...q.limitRanges.map((r) => r.fromMs))),
      iso(q.toMs),
    ]),
  );
  const row = rows[0] as { channels: string; limits: string };
  const read = (text: string) => {
    const out = new Map<string, StoredHours>();
    for (const [id, hours] of Object.entries(JSON.parse(text) as Record<string, StoredHours>)) out.set(id, q.columns ? sortedByHour(hours) : hours);
    return out;
  };
  return { channels: read(row.channels), limits: read(row.limits) };
}

const columnNames = ['i', 'value', 'status', 'reason', 'coverage', 'o2PercentDry', 'massKgPerHour'] as const;

/** The hours in ascending order: as they came when they did (one pass to check), else sorted. */
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
