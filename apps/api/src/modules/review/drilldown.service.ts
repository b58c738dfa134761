/**
 * Drill-down from an hourly value to the raw readings behind it and the imports that brought them:
 * the current readings of a channel over a range, optionally with the superseded ones (the raw
 * rows a correction or a re-import replaced), and the channel's stored hours over the same range.
 */
import { millisecondsInHour } from '@flueledger/calc';
import { loadChannelHours } from '../results/results.repo';
import { toIso, toIsoRequired } from '../sites/db-values';
import { type ReviewCtx, checkRange, findVisibleChannel, parseInstant } from './review-access';
import type { ReadingsDto, ReadingsQuery } from './review.schemas';

/** Longest drill-down range: a month of one-minute readings. */
export const MAX_DRILLDOWN_DAYS = 31;
/** Most rows one answer carries; `truncated` says when more exist. */
export const MAX_DRILLDOWN_ROWS = 50_000;

interface ReadingRow {
  id: string;
  t: Date;
  value: number | null;
  status: string;
  import_id: string | null;
  created_by: string | null;
  created_at: Date;
  superseded_at: Date | null;
  superseded_by: string | null;
  reason: string | null;
}

export async function getReadings(ctx: ReviewCtx, channelId: string, query: ReadingsQuery): Promise<ReadingsDto> {
  const channel = await findVisibleChannel(ctx, channelId);
  const tz = channel.time_zone;
  let from: number;
  let to: number;
  if (query.from && query.to) {
    from = parseInstant(query.from, tz);
    to = parseInstant(query.to, tz);
  } else if (query.from) {
    from = parseInstant(query.from, tz);
    to = from + 24 * millisecondsInHour;
  } else {
    // The channel's last day of readings (or the last 24 hours).
    const { rows } = await ctx.db.raw(
      'select (extract(epoch from max(t)) * 1000)::float8 as last from readings where tenant_id = ? and channel_id = ? and superseded_at is null',
      [ctx.tenantId, channelId],
    );
    const last = (rows[0]?.last as number | null) ?? Date.now();
    to = query.to ? parseInstant(query.to, tz) : Math.floor(last / millisecondsInHour) * millisecondsInHour + millisecondsInHour;
    from = to - 24 * millisecondsInHour;
  }
  checkRange(from, to, MAX_DRILLDOWN_DAYS);

  const qb = ctx
    .db('readings')
    .where({ tenant_id: ctx.tenantId, channel_id: channelId })
    .where('t', '>=', new Date(from))
    .where('t', '<', new Date(to))
    .orderBy([{ column: 't' }, { column: 'id' }])
    .limit(MAX_DRILLDOWN_ROWS + 1)
    .select('id', 't', 'value', 'status', 'import_id', 'created_by', 'created_at', 'superseded_at', 'superseded_by', 'reason');
  if (!query.includeSuperseded) qb.whereNull('superseded_at');
  const rows = (await qb) as ReadingRow[];
  const truncated = rows.length > MAX_DRILLDOWN_ROWS;
  if (truncated) rows.length = MAX_DRILLDOWN_ROWS;

  const importIds = [...new Set(rows.map((r) => r.import_id).filter((id): id is string => id !== null))];
  const imports = importIds.length
    ? ((await ctx
        .db('imports')
        .where({ tenant_id: ctx.tenantId })
        .whereIn('id', importIds)
        .orderBy('uploaded_at')
        .select('id', 'file_name', 'sha256', 'state', 'uploaded_at', 'uploaded_by', 'committed_at', 'committed_by', 'rolled_back_at')) as {
        id: string;
        file_name: string;
        sha256: string;
        state: string;
        uploaded_at: Date;
        uploaded_by: string;
        committed_at: Date | null;
        committed_by: string | null;
        rolled_back_at: Date | null;
      }[])
    : [];
  // An import's readings name no author of their own: it is the import's committer.
  const committerOf = new Map(imports.map((i) => [i.id, i.committed_by]));
  const authorOf = (r: ReadingRow): string | null => r.created_by ?? (r.import_id === null ? null : (committerOf.get(r.import_id) ?? null));
  const authorIds = [...new Set(rows.map(authorOf).filter((id): id is string => id !== null))];
  const authorNames = new Map(
    authorIds.length === 0 ? [] : ((await ctx.db('users').whereIn('id', authorIds).select('id', 'name')) as { id: string; name: string }[]).map((u) => [u.id, u.name]),
  );

  const hourFrom = Math.floor(from / millisecondsInHour) * millisecondsInHour;
  const hourTo = Math.ceil(to / millisecondsInHour) * millisecondsInHour;
  const hours = await loadChannelHours({ tenantId: ctx.tenantId, db: ctx.db }, [channelId], hourFrom, hourTo);

  return {
    channel: {
      id: channel.id,
      stackId: channel.stack_id,
      parameter: channel.parameter,
      unit: channel.unit,
      basis: channel.basis,
      intervalMinutes: channel.interval_minutes,
    },
    from: new Date(from).toISOString(),
    to: new Date(to).toISOString(),
    includeSuperseded: query.includeSuperseded,
    items: rows.map((r) => ({
      id: String(r.id),
      t: toIsoRequired(r.t),
      value: r.value,
      status: r.status,
      current: r.superseded_at === null,
      importId: r.import_id,
      createdBy: authorOf(r),
      createdByName: authorNames.get(authorOf(r) ?? '') ?? null,
      createdAt: toIsoRequired(r.created_at),
      supersededAt: toIso(r.superseded_at),
      supersededBy: r.superseded_by === null ? null : String(r.superseded_by),
      reason: r.reason,
    })),
    truncated,
    imports: imports.map((i) => ({
      id: i.id,
      fileName: i.file_name,
      sha256: i.sha256,
      state: i.state,
      uploadedAt: toIsoRequired(i.uploaded_at),
      uploadedBy: i.uploaded_by,
      committedAt: toIso(i.committed_at),
      rolledBackAt: toIso(i.rolled_back_at),
    })),
    hours: hours.map((h) => ({
      hourStart: new Date(h.hourStart).toISOString(),
      value: h.value,
      status: h.status,
      coverage: h.coverage,
      reason: h.reason,
      readingsValid: h.readingsValid,
      readingsTotal: h.readingsTotal,
    })),
  };
}
