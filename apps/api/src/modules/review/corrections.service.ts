/**
 * Corrections of a channel's readings by the officer: invalidate a time range, or substitute a
 * value for every reading interval of it (filling gaps too), always with a reason. Raw rows are
 * never changed: each affected current reading gets a new row that supersedes it (who, when,
 * why), the change is written to the audit trail, and the hourly results are recomputed — all in
 * the request's transaction.
 */
import { Unprocessable } from '../../lib/errors';
import { audit } from '../../lib/audit';
import { onReadingsChanged } from '../readings/readings.hooks';
import { ensureMonthPartitions, lockStackReadings } from '../readings/readings.store';
import { wholeHours } from '../results/results.service';
import { type ReviewCtx, checkRange, findVisibleChannel } from './review-access';
import type { CorrectionBody, CorrectionResultDto } from './review.schemas';
import { millisecondsInHour } from '@flueledger/calc';

/** Longest range one correction may cover. */
export const MAX_CORRECTION_DAYS = 92;

/** Working table of one correction: the interval starts it touches and the current row at each. */
const SLOTS = 'correction_slots';

export async function correctReadings(ctx: ReviewCtx, channelId: string, body: CorrectionBody): Promise<CorrectionResultDto> {
  const channel = await findVisibleChannel(ctx, channelId);
  const from = Date.parse(body.from);
  const to = Date.parse(body.to);
  checkRange(from, to, MAX_CORRECTION_DAYS);
  const fromIso = new Date(from).toISOString();
  const toIso = new Date(to).toISOString();
  const db = ctx.db;

  // One writer of the stack's readings at a time (imports take the same lock).
  await lockStackReadings(db, channel.stack_id);
  if (body.action === 'substitute') await ensureMonthPartitions(db, 'readings', from, to);

  await db.raw(`drop table if exists pg_temp.${SLOTS}`);
  await db.raw(`create temp table ${SLOTS} (t timestamptz primary key, old_id bigint, old_value double precision, old_status text) on commit drop`);
  await db.raw(
    `insert into ${SLOTS} (t, old_id, old_value, old_status)
     select t, id, value, status from readings
      where tenant_id = ? and channel_id = ? and t >= ? and t < ? and superseded_at is null
        ${body.action === 'invalidate' ? "and status <> 'invalidated'" : ''}`,
    [ctx.tenantId, channelId, fromIso, toIso],
  );
  if (body.action === 'substitute') {
    // Intervals of the channel's logging grid that hold no reading get one too: a substitution
    // fills missing data as well as replacing measured values.
    const intervalMs = channel.interval_minutes * 60_000;
    const firstSlot = Math.ceil(from / intervalMs) * intervalMs;
    if (firstSlot < to) {
      await db.raw(
        `insert into ${SLOTS} (t)
         select g.t from generate_series(?::timestamptz, ?::timestamptz, make_interval(mins => ?)) as g(t)
          where g.t < ?
            and not exists (select 1 from ${SLOTS} s where s.t >= g.t and s.t < g.t + make_interval(mins => ?))`,
        [new Date(firstSlot).toISOString(), toIso, channel.interval_minutes, toIso, channel.interval_minutes],
      );
    }
  }

  const before = (await db.raw(
    `select old_status as status, count(*)::int as readings, min(old_value) as min, max(old_value) as max
       from ${SLOTS} where old_id is not null group by old_status order by old_status`,
  )).rows as { status: string; readings: number; min: number | null; max: number | null }[];
  const { rows: countRows } = await db.raw(`select count(*)::int as slots, count(old_id)::int as existing from ${SLOTS}`);
  const { slots, existing } = countRows[0] as { slots: number; existing: number };
  if (slots === 0) {
    throw new Unprocessable(
      'nothing_to_correct',
      body.action === 'invalidate' ? 'There are no readings to invalidate in this range (or they are invalid already).' : 'The range holds no reading interval of this channel.',
    );
  }

  // 1. the current rows stop being current …
  await db.raw(
    `update readings r set superseded_at = now()
       from ${SLOTS} s
      where r.tenant_id = ? and r.channel_id = ? and r.t >= ? and r.t < ? and r.superseded_at is null
        and s.old_id is not null and r.id = s.old_id and r.t = s.t`,
    [ctx.tenantId, channelId, fromIso, toIso],
  );
  // 2. … the correction rows become current (an invalidated row keeps the measured value for the record) …
  const valueSql = body.action === 'substitute' ? '?::float8' : 's.old_value';
  const insertBindings = body.action === 'substitute' ? [body.valuePerReading as number] : [];
  const inserted = await db.raw(
    `insert into readings (tenant_id, channel_id, t, value, status, created_by, reason)
     select ?, ?, s.t, ${valueSql}, ?, ?, ? from ${SLOTS} s`,
    [ctx.tenantId, channelId, ...insertBindings, body.action === 'substitute' ? 'substituted' : 'invalidated', ctx.userId, body.reason],
  );
  // 3. … and each old row points at the row that replaced it.
  await db.raw(
    `update readings o set superseded_by = n.id
       from ${SLOTS} s, readings n
      where o.tenant_id = ? and o.channel_id = ? and o.t >= ? and o.t < ? and o.superseded_by is null
        and s.old_id is not null and o.id = s.old_id and o.t = s.t
        and n.tenant_id = o.tenant_id and n.channel_id = o.channel_id and n.t = s.t and n.superseded_at is null`,
    [ctx.tenantId, channelId, fromIso, toIso],
  );
  await db.raw(`drop table pg_temp.${SLOTS}`);

  const result: CorrectionResultDto = {
    channelId,
    action: body.action,
    from: fromIso,
    to: toIso,
    reason: body.reason,
    valuePerReading: body.action === 'substitute' ? (body.valuePerReading ?? null) : null,
    superseded: existing,
    inserted: inserted.rowCount ?? slots,
    hoursRecomputed: 0,
  };
  await audit(ctx, {
    action: body.action === 'substitute' ? 'readings.substituted' : 'readings.invalidated',
    entity: 'channel',
    entityId: channelId,
    before: { from: fromIso, to: toIso, readingsByStatus: before },
    after: { action: body.action, reason: body.reason, valuePerReading: result.valuePerReading, superseded: result.superseded, inserted: result.inserted },
  });

  await onReadingsChanged({ tenantId: ctx.tenantId, userId: ctx.userId, requestId: ctx.requestId, db }, { channelIds: [channelId], from: new Date(from), to: new Date(to) });
  const hours = wholeHours(from, to);
  result.hoursRecomputed = (hours.to - hours.from) / millisecondsInHour;
  return result;
}
