/**
 * Queries of the hourly results: current readings of a channel, and the stored hourly values of
 * channels (`hourly_values`) and limits (`limit_hourly_values`). Writes replace a range of hours
 * set-based: one DELETE and one INSERT … SELECT FROM unnest(arrays) per channel or limit.
 */
import type { ReadingColumns } from '@flueledger/calc';
import type { Knex } from 'knex';
import { float8Param, int4Param, nullableTextParam, textParam, timestamptzParam, uuidRunsParam } from '../../lib/pg-arrays';
import { ensureMonthPartitions } from '../readings/readings.store';
import { type ChannelHourRow, DB_READING_STATUSES, type DbReadingStatus, READING_STATUS_CODE } from './channel-hours';
import type { LimitHourRow } from './limit-hours';
import type { ResultsScope } from './stack-context';

const iso = (ms: number) => new Date(ms).toISOString();


/** Stored reading status (1-based position in DB_READING_STATUSES, as SQL computes it). */
const statusIndexSql = `array_position(array[${DB_READING_STATUSES.map((s) => `'${s}'`).join(',')}]::text[], r.status)`;

type PackedReadings = { t: number[]; v: (number | null)[]; s: number[] };

function unpackReadings(packed: PackedReadings): ReadingColumns {
  const n = packed.t.length;
  const t = Float64Array.from(packed.t);
  const value = new Float64Array(n);
  const status = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const v = packed.v[i];
    value[i] = v === null || v === undefined ? NaN : v;
    status[i] = READING_STATUS_CODE[DB_READING_STATUSES[packed.s[i]! - 1] as DbReadingStatus];
  }
  return { t, value, status };
}

/**
 * Current readings in [fromMs, toMs) of several channels in one statement, as engine columns by
 * channel id (channels without readings are absent). Each channel's readings come back as one
 * JSON document of three arrays (epoch ms, value, status index), which parses an order of
 * magnitude faster than a row object per reading. The three arrays are built by the same
 * aggregate step, so they stay aligned; they are not sorted (three sorts of 44,640 readings per
 * channel cost more than the rest): the hourly aggregation takes readings in any order.
 */
export async function loadCurrentReadingsOf(scope: ResultsScope, channelIds: readonly string[], fromMs: number, toMs: number): Promise<Map<string, ReadingColumns>> {
  const out = new Map<string, ReadingColumns>();
  if (channelIds.length === 0) return out;
  // One aggregate per channel (a lateral subquery over the index), not a GROUP BY: grouping
  // 357,120 readings by channel sorts or hashes them all, and array states spill past work_mem.
  const { rows } = await scope.db.raw(
    `select c.id::text as channel_id, x.columns
       from unnest(?::uuid[]) as c(id)
       cross join lateral (
         select json_build_object('t', array_agg(date_part('epoch', r.t) * 1000), 'v', array_agg(r.value),
                                  's', array_agg(${statusIndexSql}))::text as columns, count(*) as n
           from readings r
          where r.tenant_id = ? and r.channel_id = c.id and r.superseded_at is null and r.t >= ? and r.t < ?
       ) x
      where x.n > 0`,
    [[...channelIds], scope.tenantId, iso(fromMs), iso(toMs)],
  );
  for (const r of rows as { channel_id: string; columns: string }[]) out.set(r.channel_id, unpackReadings(JSON.parse(r.columns) as PackedReadings));
  return out;
}

/**
 * First and last timestamp (UTC ms) of the current readings of each channel as seen from
 * [fromMs, toMs), in one statement: exact inside the range; a reading before (after) the range
 * stands for every earlier (later) one, since callers only clip the range with it. Each bound is
 * one probe of the current-readings index that stops at its first row, so the work does not grow
 * with the months of history (a plain min/max over all of them read every month partition).
 * Channels without current readings are absent.
 */
export async function currentReadingSpans(scope: ResultsScope, channelIds: readonly string[], fromMs: number, toMs: number): Promise<Map<string, { first: number; last: number }>> {
  const out = new Map<string, { first: number; last: number }>();
  if (channelIds.length === 0) return out;
  const probe = (condition: string, order: 'asc' | 'desc') =>
    `(select t from readings r where r.tenant_id = :tenantId and r.channel_id = c.id and r.superseded_at is null and ${condition} order by t ${order} limit 1)`;
  const { rows } = await scope.db.raw(
    `select c.id::text as channel_id,
            date_part('epoch', coalesce(${probe('r.t < :from', 'desc')}, ${probe('r.t >= :from', 'asc')})) * 1000 as first,
            date_part('epoch', coalesce(${probe('r.t >= :to', 'asc')}, ${probe('r.t < :to', 'desc')})) * 1000 as last
       from unnest(:ids::uuid[]) as c(id)`,
    { tenantId: scope.tenantId, ids: [...channelIds], from: iso(fromMs), to: iso(toMs) } as unknown as Knex.RawBinding,
  );
  for (const r of rows as { channel_id: string; first: number | null; last: number | null }[]) {
    if (r.first !== null && r.last !== null) out.set(r.channel_id, { first: r.first, last: r.last });
  }
  return out;
}

/** Creates the month partitions of both hourly tables for [fromMs, toMs). */
export async function ensureHourlyPartitions(scope: ResultsScope, fromMs: number, toMs: number): Promise<void> {
  if (!(toMs > fromMs)) return;
  await ensureMonthPartitions(scope.db, 'hourly_values', fromMs, toMs);
  await ensureMonthPartitions(scope.db, 'limit_hourly_values', fromMs, toMs);
}

/** Replaces the channel's hourly values in [fromMs, toMs) by `rows` (which lie inside it). */
export async function replaceChannelHours(scope: ResultsScope, channelId: string, fromMs: number, toMs: number, rows: readonly ChannelHourRow[]): Promise<void> {
  await replaceChannelHoursOf(scope, [channelId], fromMs, toMs, new Map([[channelId, rows]]));
}

/**
 * Replaces the hourly values of several channels in [fromMs, toMs) by `rowsByChannel` (rows lie
 * inside the range; a channel without rows keeps none there): one DELETE and one INSERT for all.
 */
export async function replaceChannelHoursOf(
  scope: ResultsScope,
  channelIds: readonly string[],
  fromMs: number,
  toMs: number,
  rowsByChannel: ReadonlyMap<string, readonly ChannelHourRow[]>,
): Promise<void> {
  if (channelIds.length === 0) return;
  await scope.db.raw('delete from hourly_values where tenant_id = ? and channel_id = any(?::uuid[]) and hour_start >= ? and hour_start < ?', [
    scope.tenantId,
    [...channelIds],
    iso(fromMs),
    iso(toMs),
  ]);
  const ids: string[] = [];
  const counts: number[] = [];
  const all: ChannelHourRow[] = [];
  for (const channelId of channelIds) {
    const rows = rowsByChannel.get(channelId) ?? [];
    if (rows.length === 0) continue;
    ids.push(channelId);
    counts.push(rows.length);
    for (const r of rows) all.push(r);
  }
  if (all.length === 0) return;
  // Binary array parameters (lib/pg-arrays.ts): nothing is turned into text on either side.
  await scope.db.raw(
    `insert into hourly_values (tenant_id, channel_id, hour_start, value, status, coverage, readings_valid, readings_total, reason, computed_at)
     select ?, u.ch, u.h, u.v, u.s, u.c, u.rv, u.rt, u.r, now()
       from unnest(?::uuid[], ?::timestamptz[], ?::float8[], ?::text[], ?::float8[], ?::int4[], ?::int4[], ?::text[]) as u(ch, h, v, s, c, rv, rt, r)`,
    [
      scope.tenantId,
      uuidRunsParam(ids, counts),
      timestamptzParam(all.map((r) => r.hourStart)),
      float8Param(all.map((r) => nullAsNaN(r.value))),
      textParam(all.map((r) => r.status)),
      float8Param(all.map((r) => clampCoverage(r.coverage))),
      int4Param(all.map((r) => r.readingsValid)),
      int4Param(all.map((r) => r.readingsTotal)),
      nullableTextParam(all.map((r) => r.reason)),
    ],
  );
}

/** A nullable number as float8Param takes it (NaN is sent as NULL). */
const nullAsNaN = (value: number | null): number => (value === null ? NaN : value);

/** Coverage as stored (0–1). */
export function clampCoverage(coverage: number): number {
  return Math.min(1, Math.max(0, coverage));
}

/** Replaces the limit's hourly values in [fromMs, toMs) by `rows`. */
export async function replaceLimitHours(scope: ResultsScope, limitId: string, fromMs: number, toMs: number, rows: readonly LimitHourRow[]): Promise<void> {
  await scope.db.raw('delete from limit_hourly_values where tenant_id = ? and limit_id = ? and hour_start >= ? and hour_start < ?', [
    scope.tenantId,
    limitId,
    iso(fromMs),
    iso(toMs),
  ]);
  if (rows.length === 0) return;
  await scope.db.raw(
    `insert into limit_hourly_values (tenant_id, limit_id, hour_start, value, status, reason, o2_percent_dry, coverage, dry_mg_per_nm3,
                                      mass_kg_per_hour, channel_id, computed_at)
     select ?, ?, u.h, u.v, u.s, u.r, u.o2, u.c, u.d, u.m, ?, now()
       from unnest(?::timestamptz[], ?::float8[], ?::text[], ?::text[], ?::float8[], ?::float8[], ?::float8[], ?::float8[])
         as u(h, v, s, r, o2, c, d, m)`,
    [
      scope.tenantId,
      limitId,
      rows[0]!.channelId,
      timestamptzParam(rows.map((r) => r.hourStart)),
      float8Param(rows.map((r) => nullAsNaN(r.value))),
      textParam(rows.map((r) => r.status)),
      nullableTextParam(rows.map((r) => r.reason)),
      float8Param(rows.map((r) => nullAsNaN(r.o2PercentDry))),
      float8Param(rows.map((r) => (r.coverage === null ? NaN : clampCoverage(r.coverage)))),
      float8Param(rows.map((r) => nullAsNaN(r.dryMgPerNm3))),
      float8Param(rows.map((r) => nullAsNaN(r.massKgPerHour))),
    ],
  );
}

/** A stored channel hour, as read back. */
export interface StoredChannelHour extends ChannelHourRow {
  channelId: string;
  /** When the oldest of the channel's loaded hours was computed (UTC ms). */
  computedAt: number;
}

/**
 * Stored hourly values of the channels in [fromMs, toMs), ordered by channel and hour. One row
 * per channel comes back, its hours as one JSON array: a month of eight channels is 5,760 hours,
 * and one JSON document per channel parses several times faster than a row object per hour.
 */
export async function loadChannelHours(scope: ResultsScope, channelIds: readonly string[], fromMs: number, toMs: number): Promise<StoredChannelHour[]> {
  if (channelIds.length === 0) return [];
  const { rows } = await scope.db.raw(
    `select channel_id, date_part('epoch', min(computed_at)) * 1000 as computed,
            json_agg(json_build_array(date_part('epoch', hour_start) * 1000, value, status, coverage, readings_valid, readings_total, reason)
                     order by hour_start) as hours
       from hourly_values
      where tenant_id = ? and channel_id = any(?::uuid[]) and hour_start >= ? and hour_start < ?
      group by channel_id
      order by channel_id`,
    [scope.tenantId, [...channelIds], iso(fromMs), iso(toMs)],
  );
  const out: StoredChannelHour[] = [];
  for (const r of rows as { channel_id: string; computed: number; hours: [number, number | null, string, number, number, number, string | null][] }[]) {
    for (const h of r.hours) {
      out.push({
        channelId: r.channel_id,
        hourStart: h[0],
        value: h[1],
        status: h[2] as ChannelHourRow['status'],
        coverage: h[3],
        readingsValid: h[4],
        readingsTotal: h[5],
        reason: h[6],
        computedAt: r.computed,
      });
    }
  }
  return out;
}

/** A stored limit hour, as read back. */
export interface StoredLimitHour extends LimitHourRow {
  limitId: string;
  /** When the oldest of the limit's loaded hours was computed (UTC ms). */
  computedAt: number;
}

/** Stored hourly values of the limits in [fromMs, toMs), ordered by limit and hour (one JSON array per limit). */
export async function loadLimitHours(scope: ResultsScope, limitIds: readonly string[], fromMs: number, toMs: number): Promise<StoredLimitHour[]> {
  if (limitIds.length === 0) return [];
  const { rows } = await scope.db.raw(
    `select limit_id, min(channel_id::text) as channel_id, date_part('epoch', min(computed_at)) * 1000 as computed,
            json_agg(json_build_array(date_part('epoch', hour_start) * 1000, value, status, reason, o2_percent_dry, coverage,
                                      dry_mg_per_nm3, mass_kg_per_hour) order by hour_start) as hours
       from limit_hourly_values
      where tenant_id = ? and limit_id = any(?::uuid[]) and hour_start >= ? and hour_start < ?
      group by limit_id
      order by limit_id`,
    [scope.tenantId, [...limitIds], iso(fromMs), iso(toMs)],
  );
  type Packed = [number, number | null, string, string | null, number | null, number | null, number | null, number | null];
  const out: StoredLimitHour[] = [];
  for (const r of rows as { limit_id: string; channel_id: string; computed: number; hours: Packed[] }[]) {
    for (const h of r.hours) {
      out.push({
        limitId: r.limit_id,
        hourStart: h[0],
        value: h[1],
        status: h[2] as LimitHourRow['status'],
        reason: h[3],
        o2PercentDry: h[4],
        coverage: h[5],
        dryMgPerNm3: h[6],
        massKgPerHour: h[7],
        channelId: r.channel_id,
        computedAt: r.computed,
      });
    }
  }
  return out;
}
