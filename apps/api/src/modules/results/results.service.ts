/**
 * Hourly results, kept in step with the readings: after readings change (import commit,
 * rollback, correction) the affected hours of the changed channels are recomputed, then the
 * hours of every limit of the stack that reads one of those channels. Runs in the caller's
 * transaction, so the results commit or roll back with the readings they come from.
 *
 * Limits and fuel analyses change outside this module: `refreshStaleLimitHours` recomputes a
 * limit's hours lazily, on read, when they are older than the limit, one of its channels or the
 * fuel analysis they used (or are missing for hours the pollutant has).
 */
import { millisecondsInHour, type HourlySeries } from '@flueledger/calc';
import { type ChannelHourRow, channelHours, seriesFromStoredHours, validityRuleFor } from './channel-hours';
import { type LimitPlan, deriveLimitHours, planLimit } from './limit-hours';
import {
  type StoredChannelHour,
  clampCoverage,
  currentReadingSpans,
  ensureHourlyPartitions,
  loadChannelHours,
  loadCurrentReadingsOf,
  replaceChannelHours,
  replaceChannelHoursOf,
  replaceLimitHours,
} from './results.repo';
import { type ResultsScope, type StackContext, loadStackContext, stacksOfChannels } from './stack-context';
import type { LimitRow } from '../permits/limits.repo';

export interface HourRange {
  /** UTC ms, inclusive. */
  from: number;
  /** UTC ms, exclusive. */
  to: number;
}

/** The whole hours that cover [from, to). */
export function wholeHours(from: number, to: number): HourRange {
  return { from: Math.floor(from / millisecondsInHour) * millisecondsInHour, to: Math.ceil(to / millisecondsInHour) * millisecondsInHour };
}

export interface RecomputeSummary {
  channels: number;
  limits: number;
  hours: number;
}

/**
 * Recomputes the hourly values of `channelIds` over the whole hours covering [from, to), and the
 * limit hours that depend on them.
 */
export async function recomputeForReadings(scope: ResultsScope, change: { channelIds: readonly string[]; from: Date; to: Date }): Promise<RecomputeSummary> {
  const summary: RecomputeSummary = { channels: 0, limits: 0, hours: 0 };
  if (change.channelIds.length === 0 || !(change.to.getTime() > change.from.getTime())) return summary;
  const range = wholeHours(change.from.getTime(), change.to.getTime());
  summary.hours = (range.to - range.from) / millisecondsInHour;
  await ensureHourlyPartitions(scope, range.from, range.to);
  const byStack = await stacksOfChannels(scope, change.channelIds);
  for (const [stackId, changed] of byStack) {
    const ctx = await loadStackContext(scope, stackId);
    if (!ctx) continue;
    const changedSet = new Set(changed);
    const changedIds = ctx.channels.filter((c) => changedSet.has(c.id)).map((c) => c.id);
    // All changed channels at once: one span query, one readings query, one delete + insert.
    const computed = await computeChannelHoursOf(scope, ctx, changedIds, range);
    await replaceChannelHoursOf(scope, changedIds, range.from, range.to, computed);
    summary.channels += changedIds.length;
    // The limits use the hours just computed (not read back); only unchanged inputs are loaded.
    const now = Date.now();
    const known = new Map<string, StoredChannelHour[]>();
    for (const id of changedIds) known.set(id, (computed.get(id) ?? []).map((r) => ({ ...r, channelId: id, computedAt: now })));
    const plans = ctx.limits
      .map((limit) => ({ limit, plan: planLimit(ctx, limit) }))
      .filter(({ plan }) => !plan.ok || plan.channelIds.some((id) => changedSet.has(id)));
    const missing = [...new Set(plans.flatMap(({ plan }) => (plan.ok ? plan.channelIds : [])))].filter((id) => !known.has(id));
    if (missing.length > 0) {
      for (const id of missing) known.set(id, []);
      for (const h of await loadChannelHours(scope, missing, range.from, range.to)) known.get(h.channelId)!.push(h);
    }
    for (const { limit, plan } of plans) {
      if (!plan.ok) await replaceLimitHours(scope, limit.id, range.from, range.to, []);
      else {
        const rows = deriveLimitHours(limit, plan, seriesByChannel(plan.channelIds.flatMap((id) => known.get(id) ?? [])), ctx.fuel);
        await replaceLimitHours(scope, limit.id, range.from, range.to, rows);
      }
      summary.limits++;
    }
  }
  return summary;
}

/** The whole hours of a channel that get a row: those of `range` between its first and last current reading. */
function storedHourSpan(range: HourRange, span: { first: number; last: number } | undefined): HourRange | null {
  if (!span) return null;
  const from = Math.max(range.from, Math.floor(span.first / millisecondsInHour) * millisecondsInHour);
  const to = Math.min(range.to, Math.floor(span.last / millisecondsInHour) * millisecondsInHour + millisecondsInHour);
  return to > from ? { from, to } : null;
}

/**
 * Hourly values of several channels of a stack over `range` (same rules as
 * `recomputeChannelHours`), without storing them: rows by channel id.
 */
export async function computeChannelHoursOf(
  scope: ResultsScope,
  ctx: StackContext,
  channelIds: readonly string[],
  range: HourRange,
): Promise<Map<string, ChannelHourRow[]>> {
  const out = new Map<string, ChannelHourRow[]>();
  const spans = await currentReadingSpans(scope, channelIds);
  const hourSpans = new Map<string, HourRange>();
  for (const id of channelIds) {
    const hours = storedHourSpan(range, spans.get(id));
    if (hours) hourSpans.set(id, hours);
    else out.set(id, []);
  }
  if (hourSpans.size === 0) return out;
  // Readings outside a channel's own span do not exist, so one load over the range serves all.
  const readings = await loadCurrentReadingsOf(scope, [...hourSpans.keys()], range.from, range.to);
  const rule = validityRuleFor(ctx.regime);
  for (const [id, hours] of hourSpans) {
    const channel = ctx.channels.find((c) => c.id === id)!;
    const columns = readings.get(id) ?? { t: new Float64Array(0), value: new Float64Array(0), status: new Uint8Array(0) };
    const rows = channelHours(columns, { fromMs: hours.from, toMs: hours.to, intervalMinutes: channel.intervalMinutes, rule });
    for (const r of rows) r.coverage = clampCoverage(r.coverage);
    out.set(id, rows);
  }
  return out;
}

/**
 * Hourly values of one channel over `range`. Hours between the channel's first and last current
 * reading are stored (an hour without readings there is missing data: invalid, `no_readings`);
 * hours outside that span have no row.
 */
export async function recomputeChannelHours(scope: ResultsScope, ctx: StackContext, channelId: string, range: HourRange): Promise<void> {
  if (!ctx.channels.some((c) => c.id === channelId)) return;
  const rows = (await computeChannelHoursOf(scope, ctx, [channelId], range)).get(channelId) ?? [];
  await replaceChannelHours(scope, channelId, range.from, range.to, rows);
}

/** Series of stored channel hours by channel id. */
export function seriesByChannel(rows: readonly StoredChannelHour[]): Map<string, HourlySeries> {
  const grouped = new Map<string, StoredChannelHour[]>();
  for (const r of rows) {
    let list = grouped.get(r.channelId);
    if (!list) grouped.set(r.channelId, (list = []));
    list.push(r);
  }
  return new Map([...grouped].map(([id, list]) => [id, seriesFromStoredHours(list)]));
}

/** A limit's hourly values over `range`, from the stored hourly values of its channels. */
export async function recomputeLimitHours(
  scope: ResultsScope,
  ctx: StackContext,
  limit: LimitRow,
  range: HourRange,
  plan: LimitPlan = planLimit(ctx, limit),
): Promise<void> {
  if (!plan.ok) {
    await replaceLimitHours(scope, limit.id, range.from, range.to, []);
    return;
  }
  const hours = await loadChannelHours(scope, plan.channelIds, range.from, range.to);
  const rows = deriveLimitHours(limit, plan, seriesByChannel(hours), ctx.fuel);
  await replaceLimitHours(scope, limit.id, range.from, range.to, rows);
}

/** Recomputes every channel and limit of a stack over `range` (seeds, repairs). */
export async function recomputeStack(scope: ResultsScope, stackId: string, range: HourRange): Promise<RecomputeSummary> {
  const ctx = await loadStackContext(scope, stackId);
  if (!ctx) return { channels: 0, limits: 0, hours: 0 };
  return recomputeForReadings(scope, { channelIds: ctx.channels.map((c) => c.id), from: new Date(range.from), to: new Date(range.to) });
}

/**
 * Whether a limit's stored hours in a range are out of date: computed before the limit, one of
 * its channels or the fuel analysis it uses last changed, or missing for hours its pollutant
 * channel has.
 */
export function limitHoursStale(
  ctx: StackContext,
  limit: LimitRow,
  plan: LimitPlan,
  stored: { count: number; oldestComputedAt: number },
  pollutantHours: number,
): boolean {
  if (!plan.ok) return stored.count > 0;
  if (stored.count !== pollutantHours) return true;
  if (stored.count === 0) return false;
  let changedAt = new Date(limit.updated_at).getTime();
  for (const c of ctx.channels) if (plan.channelIds.includes(c.id)) changedAt = Math.max(changedAt, c.updatedAt.getTime());
  if (plan.usesFuel && ctx.fuel) changedAt = Math.max(changedAt, ctx.fuel.analysisCreatedAt.getTime());
  return stored.oldestComputedAt < changedAt;
}
