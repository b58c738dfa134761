/**
 * What the review reads of the stored hourly results: per channel and per limit a change marker of
 * its stored hours (count, oldest and newest `computed_at`, last hour) and, when asked, the hours
 * themselves as parallel columns, with no object per hour on either side.
 *
 * The hours are read as built documents, one per channel or limit and UTC month (table
 * `hourly_columns`, migration 20261211000100, which explains why they are never stale): a month of
 * a stack is a couple of dozen stored JSON texts fetched by primary key, not thousands of rows
 * aggregated and encoded on every request. A document missing for the version the reader sees is
 * built from the hourly rows in one statement (hours and version from one snapshot) and stored for
 * the next reader.
 *
 * A document holds the month's values in full and the rest compactly: the hour offsets only when
 * they are not the plain run first, first + 1, …; statuses, reasons and coverages as their
 * exceptions (the hours not valid, with a reason, not fully covered) with the offsets they belong
 * to; each hour's `computed_at` only when the hours were not all computed at once.
 *
 * The markers decide whether stored limit hours are stale and make the review's entity tag.
 */
import { createHash } from 'node:crypto';
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

/**
 * Names the documents' layout and legends. Part of a document's key: a release that changes
 * either builds new documents instead of misreading old ones.
 */
const FORMAT = createHash('sha256')
  .update(JSON.stringify(['hourly-columns-1', HOUR_STATUS_LEGEND, HOUR_REASON_LEGEND]))
  .digest('base64url')
  .slice(0, 16);
const formatOf = (kind: SeriesKind, derivation: boolean) => (kind === 'limit' && derivation ? `${FORMAT}+derivation` : FORMAT);

type SeriesKind = 'channel' | 'limit';

// Per row: the hour's offset from the month's start, status code and reason code (every aggregate orders by the offset).
const rowCodes = `, ((date_part('epoch', hour_start) - date_part('epoch', k.month_start)) / 3600)::int as off,
  coalesce(array_position(:statuses::text[], status) - 1, ${UNKNOWN_STATUS_CODE}) as code,
  coalesce(array_position(:reasons::text[], reason) - 1, 0) as rcode`;
// No reason, or a word the legend does not know, is code 0 ('none'), as the engine reads it.
const commonFields = `'count', count(*), 'first', min(off), 'last', max(off),
  'oldest', date_part('epoch', min(computed_at)) * 1000, 'newest', date_part('epoch', max(computed_at)) * 1000,
  'computedAt', case when min(computed_at) = max(computed_at) then null else array_agg(date_part('epoch', computed_at) * 1000 order by off) end,
  'i', case when array_agg(off order by off) = array(select generate_series(min(off), max(off))) then null else array_agg(off order by off) end,
  'value', array_agg(value order by off),
  'statusAt', array_agg(off order by off) filter (where code <> 0), 'status', array_agg(code order by off) filter (where code <> 0),
  'reasonAt', array_agg(off order by off) filter (where rcode <> 0), 'reason', array_agg(rcode order by off) filter (where rcode <> 0)`;

const BUILD_SQL = `
  with k as (
    select k.*, coalesce(v.version, 0) as version
      from unnest(:kinds::text[], :ids::uuid[], :starts::timestamptz[], :ends::timestamptz[], :formats::text[]) as k(kind, series_id, month_start, month_end, format)
      left join hourly_column_versions v
        on v.tenant_id = :tenantId and v.kind = k.kind and v.series_id = k.series_id and v.month_start = k.month_start
  ),
  built as (
    select k.kind, k.series_id, k.month_start, k.version, k.format,
           coalesce(case when k.kind = 'channel' then c.doc else l.doc end, '{"count":0}') as body
      from k
      left join lateral (
        select json_build_object(${commonFields},
                 'coverageAt', array_agg(off order by off) filter (where coverage is distinct from 1),
                 'coverage', array_agg(coverage order by off) filter (where coverage is distinct from 1))::text as doc
          from (select hour_start, computed_at, value, coverage, status, reason ${rowCodes}
                  from hourly_values
                 where tenant_id = :tenantId and channel_id = k.series_id and hour_start >= k.month_start and hour_start < k.month_end) h
        having count(*) > 0) c on k.kind = 'channel'
      left join lateral (
        select json_build_object(${commonFields},
                 'o2PercentDry', case when k.format like '%+derivation' then array_agg(o2_percent_dry order by off) end,
                 'massKgPerHour', case when k.format like '%+derivation' then array_agg(mass_kg_per_hour order by off) end)::text as doc
          from (select hour_start, computed_at, value, o2_percent_dry, mass_kg_per_hour, status, reason ${rowCodes}
                  from limit_hourly_values
                 where tenant_id = :tenantId and limit_id = k.series_id and hour_start >= k.month_start and hour_start < k.month_end) h
        having count(*) > 0) l on k.kind = 'limit'
  ),
  stored as (
    insert into hourly_columns (tenant_id, kind, series_id, month_start, version, format, body)
    select :tenantId, kind, series_id, month_start, version, format, body from built
    on conflict do nothing
  ),
  -- Documents of older versions or layouts are never read again.
  dropped as (
    delete from hourly_columns d using built b
     where d.tenant_id = :tenantId and d.kind = b.kind and d.series_id = b.series_id and d.month_start = b.month_start
       and (d.version < b.version or split_part(d.format, '+', 1) <> split_part(b.format, '+', 1))
  )
  select kind, series_id::text as series_id, (date_part('epoch', month_start) * 1000)::float8 as month_ms, body from built`;

const LOOKUP_SQL = `
  select k.kind, k.series_id::text as series_id, (date_part('epoch', k.month_start) * 1000)::float8 as month_ms, d.body
    from unnest(:kinds::text[], :ids::uuid[], :starts::timestamptz[], :formats::text[]) as k(kind, series_id, month_start, format)
    left join hourly_column_versions v
      on v.tenant_id = :tenantId and v.kind = k.kind and v.series_id = k.series_id and v.month_start = k.month_start
    left join hourly_columns d
      on d.tenant_id = :tenantId and d.kind = k.kind and d.series_id = k.series_id and d.month_start = k.month_start
     and d.version = coalesce(v.version, 0) and d.format = k.format`;

/** One channel's or limit's hours of one UTC month as a document holds them (see the file header). */
interface MonthDoc {
  count: number;
  first?: number;
  last?: number;
  oldest?: number;
  newest?: number;
  computedAt?: number[] | null;
  i?: number[] | null;
  value?: (number | null)[];
  statusAt?: number[] | null;
  status?: number[] | null;
  reasonAt?: number[] | null;
  reason?: number[] | null;
  coverageAt?: number[] | null;
  coverage?: (number | null)[] | null;
  o2PercentDry?: (number | null)[] | null;
  massKgPerHour?: (number | null)[] | null;
}

interface DocKey {
  kind: SeriesKind;
  seriesId: string;
  monthMs: number;
  format: string;
}

const keyOf = (kind: string, seriesId: string, monthMs: number) => `${kind}|${seriesId}|${monthMs}`;

/** Start (UTC ms) of every UTC month that [fromMs, toMs) touches. */
function utcMonthStarts(fromMs: number, toMs: number): number[] {
  const out: number[] = [];
  const d = new Date(fromMs);
  for (let m = Date.UTC(d.getUTCFullYear(), d.getUTCMonth(), 1); m < toMs; m = nextUtcMonth(m)) out.push(m);
  return out;
}

function nextUtcMonth(monthMs: number): number {
  const d = new Date(monthMs);
  return Date.UTC(d.getUTCFullYear(), d.getUTCMonth() + 1, 1);
}

/** The documents of `keys`: stored ones as they are, missing ones built (and stored) in one statement. */
async function loadDocs(scope: ResultsScope, keys: readonly DocKey[]): Promise<Map<string, string>> {
  const docs = new Map<string, string>();
  if (keys.length === 0) return docs;
  const found = await scope.db.raw(LOOKUP_SQL, {
    kinds: keys.map((k) => k.kind),
    ids: keys.map((k) => k.seriesId),
    starts: keys.map((k) => iso(k.monthMs)),
    formats: keys.map((k) => k.format),
    tenantId: scope.tenantId,
  } as unknown as Knex.RawBinding);
  const missing: DocKey[] = [];
  for (const row of found.rows as { kind: string; series_id: string; month_ms: number; body: string | null }[]) {
    if (row.body === null) missing.push(keys.find((k) => k.kind === row.kind && k.seriesId === row.series_id && k.monthMs === row.month_ms)!);
    else docs.set(keyOf(row.kind, row.series_id, row.month_ms), row.body);
  }
  if (missing.length > 0) {
    const built = await scope.db.raw(BUILD_SQL, {
      kinds: missing.map((k) => k.kind),
      ids: missing.map((k) => k.seriesId),
      starts: missing.map((k) => iso(k.monthMs)),
      ends: missing.map((k) => iso(nextUtcMonth(k.monthMs))),
      formats: missing.map((k) => k.format),
      statuses: [...HOUR_STATUS_LEGEND],
      reasons: [...HOUR_REASON_LEGEND],
      tenantId: scope.tenantId,
    } as unknown as Knex.RawBinding);
    for (const row of built.rows as { kind: string; series_id: string; month_ms: number; body: string }[]) docs.set(keyOf(row.kind, row.series_id, row.month_ms), row.body);
  }
  return docs;
}

/**
 * Markers and, when asked, columns of the channels' hours in the period and of each limit's hours
 * in its range (its look-back included), from the month documents.
 */
export async function loadStoredHours(scope: ResultsScope, q: StoredHoursQuery): Promise<StoredHoursRead> {
  const derivation = q.derivation === true;
  const ranges: { kind: SeriesKind; seriesId: string; fromMs: number }[] = [
    ...q.channelIds.map((id) => ({ kind: 'channel' as const, seriesId: id, fromMs: q.fromMs })),
    ...q.limitRanges.map((r) => ({ kind: 'limit' as const, seriesId: r.limitId, fromMs: Math.min(r.fromMs, q.fromMs) })),
  ];
  const keys: DocKey[] = [];
  for (const r of ranges) for (const monthMs of utcMonthStarts(r.fromMs, q.toMs)) keys.push({ kind: r.kind, seriesId: r.seriesId, monthMs, format: formatOf(r.kind, derivation) });
  const docs = await loadDocs(scope, keys);

  const out: StoredHoursRead = { channels: new Map(), limits: new Map() };
  for (const r of ranges) {
    const months = utcMonthStarts(r.fromMs, q.toMs).map((monthMs) => ({ monthMs, doc: JSON.parse(docs.get(keyOf(r.kind, r.seriesId, monthMs)) ?? '{"count":0}') as MonthDoc }));
    const hours = hoursInRange(months, r.fromMs, q.toMs, q.fromMs, r.kind === 'limit' && derivation);
    if (!hours) continue;
    (r.kind === 'channel' ? out.channels : out.limits).set(r.seriesId, q.columns ? hours : markersOf(hours));
  }
  return out;
}

const H = millisecondsInHour;

/**
 * One channel's or limit's hours in [fromMs, toMs) from its month documents (in month order), as
 * columns with offsets counted from `originMs`; null when no hour lies in the range.
 */
function hoursInRange(months: readonly { monthMs: number; doc: MonthDoc }[], fromMs: number, toMs: number, originMs: number, derivation: boolean): StoredHours | null {
  const cols = { i: [] as number[], value: [] as (number | null)[], status: [] as number[], reason: [] as number[], coverage: [] as (number | null)[], o2: [] as (number | null)[], mass: [] as (number | null)[] };
  let hasCoverage = false;
  let count = 0;
  let countInPeriod = 0;
  let oldest = Infinity;
  let newest = -Infinity;
  let last = -Infinity;
  for (const { monthMs, doc } of months) {
    const n = doc.value?.length ?? 0;
    if (doc.count === 0 || n === 0) continue;
    const first = doc.first ?? 0;
    const offsets = doc.i ?? null;
    const offsetAt = (k: number) => (offsets ? offsets[k]! : first + k);
    const indexOf = offsets ? new Map(offsets.map((o, k) => [o, k])) : null;
    const at = (o: number) => (indexOf ? indexOf.get(o)! : o - first);
    const status = exceptions(n, doc.statusAt, doc.status, 0, at);
    const reason = exceptions(n, doc.reasonAt, doc.reason, 0, at);
    const coverage = 'coverageAt' in doc ? exceptions<number | null>(n, doc.coverageAt, doc.coverage, 1, at) : null;
    if (coverage) hasCoverage = true;
    // Offsets from the month's start to offsets from the origin (whole hours: both are hour starts).
    const shift = Math.round((monthMs - originMs) / H);
    const lo = Math.ceil((fromMs - monthMs) / H);
    const hi = Math.ceil((toMs - monthMs) / H);
    for (let k = 0; k < n; k++) {
      const o = offsetAt(k);
      if (o < lo || o >= hi) continue;
      count++;
      if (o + shift >= 0) countInPeriod++;
      const computedAt = doc.computedAt ? doc.computedAt[k]! : null;
      oldest = Math.min(oldest, computedAt ?? doc.oldest!);
      newest = Math.max(newest, computedAt ?? doc.newest!);
      last = Math.max(last, monthMs + o * H);
      cols.i.push(o + shift);
      cols.value.push(doc.value![k] ?? null);
      cols.status.push(status[k]!);
      cols.reason.push(reason[k]!);
      if (coverage) cols.coverage.push(coverage[k]!);
      if (derivation) {
        cols.o2.push(doc.o2PercentDry?.[k] ?? null);
        cols.mass.push(doc.massKgPerHour?.[k] ?? null);
      }
    }
  }
  if (count === 0) return null;
  const hours: StoredHours = { count, countInPeriod, oldest, newest, last, i: cols.i, value: cols.value, status: cols.status, reason: cols.reason };
  if (hasCoverage) hours.coverage = cols.coverage;
  if (derivation) {
    hours.o2PercentDry = cols.o2;
    hours.massKgPerHour = cols.mass;
  }
  return hours;
}

/** A full column of `n` entries: `usual` except at the listed offsets. */
function exceptions<T>(n: number, offsets: readonly number[] | null | undefined, values: readonly T[] | null | undefined, usual: T, indexOf: (offset: number) => number): T[] {
  const out = new Array<T>(n).fill(usual);
  if (offsets && values) for (let e = 0; e < offsets.length; e++) out[indexOf(offsets[e]!)] = values[e]!;
  return out;
}

const markersOf = ({ count, countInPeriod, oldest, newest, last }: StoredHours): StoredHours => ({ count, countInPeriod, oldest, newest, last });
