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
import { millisecondsInHour, type HourlySeries, type ReadingColumns } from '@flueledger/calc';
import { type ChannelHourRow, channelHours, seriesFromStoredHours, validityRuleFor } from './channel-hours';
import { type LimitHourRow, type LimitPlan, deriveLimitHours, planLimit } from './limit-hours';
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
 * The complete current readings of the changed channels within the whole hours of a change, by
 * channel id, when the caller already holds them: an import into hours that held no current
 * readings of its channels brings exactly these (see `planRecompute`).
 */
export type KnownReadings = ReadonlyMap<string, ReadingColumns>;

/** The reads of a recompute are done; `compute` turns them into rows (CPU only), `store` writes them. */
export interface RecomputePlan {
  summary: RecomputeSummary;
  /** Computes every channel and limit hour of the change; touches no database. */
  compute(): RecomputeWrites;
}

/** The rows a recompute writes (from `RecomputePlan.compute`). */
export interface RecomputeWrites {
  summary: RecomputeSummary;
  stacks: {
    channelIds: string[];
    channelRows: Map<string, ChannelHourRow[]>;
    limits: { limitId: string; rows: LimitHourRow[] }[];
  }[];
  range: HourRange;
}

/**
 * Recomputes the hourly values of `channelIds` over the whole hours covering [from, to), and the
 * limit hours that depend on them.
 */
export async function recomputeForReadings(scope: ResultsScope, change: { channelIds: readonly string[]; from: Date; to: Date }, known?: KnownReadings): Promise<RecomputeSummary> {
  const plan = await planRecompute(scope, change, known);
  return storeRecompute(scope, plan.compute());
}

/**
 * The reading part of a recompute: stack contexts, channel spans, the current readings of the
 * changed channels (unless `known` brings them) and the stored hours of the other channels the
 * limits read. With `known`, the plan may be made before those readings are written (under the
 * stack's readings lock, so nothing else changes them): a channel's span is the union of what is
 * stored and what `known` holds, which is the same before and after the write. That lets an
 * import compute the hours while the database inserts the readings.
 */
export async function planRecompute(scope: ResultsScope, change: { channelIds: readonly string[]; from: Date; to: Date }, known?: KnownReadings): Promise<RecomputePlan> {
  const summary: RecomputeSummary = { channels: 0, limits: 0, hours: 0 };
  const range = wholeHours(change.from.getTime(), change.to.getTime());
  const empty: RecomputePlan = { summary, compute: () => ({ summary, stacks: [], range }) };
  if (change.channelIds.length === 0 || !(change.to.getTime() > change.from.getTime())) return empty;
  summary.hours = (range.to - range.from) / millisecondsInHour;
  await ensureHourlyPartitions(scope, range.from, range.to);
  const byStack = await stacksOfChannels(scope, change.channelIds);
  const stackPlans: (() => RecomputeWrites['stacks'][number])[] = [];
  for (const [stackId, changed] of byStack) {
    const ctx = await loadStackContext(scope, stackId);
    if (!ctx) continue;
    const changedSet = new Set(changed);
    const changedIds = ctx.channels.filter((c) => changedSet.has(c.id)).map((c) => c.id);
    // All changed channels at once: one span query, one readings query, one delete + insert.
    const readChannels = await readChannelHoursInputs(scope, ctx, changedIds, range, known);
    summary.channels += changedIds.length;
    // The limits use the hours computed here (not read back); only unchanged inputs are loaded.
    const plans = ctx.limits
      .map((limit) => ({ limit, plan: planLimit(ctx, limit) }))
      .filter(({ plan }) => !plan.ok || plan.channelIds.some((id) => changedSet.has(id)));
    const missing = [...new Set(plans.flatMap(({ plan }) => (plan.ok ? plan.channelIds : [])))].filter((id) => !changedIds.includes(id));
    const stored = new Map<string, StoredChannelHour[]>(missing.map((id) => [id, []]));
    if (missing.length > 0) for (const h of await loadChannelHours(scope, missing, range.from, range.to)) stored.get(h.channelId)!.push(h);
    summary.limits += plans.length;
    stackPlans.push(() => {
      const channelRows = readChannels();
      const now = Date.now();
      const known = new Map(stored);
      for (const id of changedIds) known.set(id, (channelRows.get(id) ?? []).map((r) => ({ ...r, channelId: id, computedAt: now })));
      const limits = plans.map(({ limit, plan }) => ({
        limitId: limit.id,
        rows: plan.ok ? deriveLimitHours(limit, plan, seriesByChannel(plan.channelIds.flatMap((id) => known.get(id) ?? [])), ctx.fuel) : [],
      }));
      return { channelIds: changedIds, channelRows, limits };
    });
  }
  return { summary, compute: () => ({ summary, stacks: stackPlans.map((computeStack) => computeStack()), range }) };
}

/** Writes the rows of a recompute: per stack, the channel hours, then each limit's hours. */
export async function storeRecompute(scope: ResultsScope, writes: RecomputeWrites): Promise<RecomputeSummary> {
  const { range } = writes;
  for (const stack of writes.stacks) {
    await replaceChannelHoursOf(scope, stack.channelIds, range.from, range.to, stack.channelRows);
    for (const limit of stack.limits) await replaceLimitHours(scope, limit.limitId, range.from, range.to, limit.rows);
  }
  return writes.summary;
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
  return (await readChannelHoursInputs(scope, ctx, channelIds, range))();
}

/** The reads of `computeChannelHoursOf` (spans, and readings unless `known` has them); the result computes the rows. */
async function readChannelHoursInputs(
  scope: ResultsScope,
  ctx: StackContext,
  channelIds: readonly string[],
  range: HourRange,
  known?: KnownReadings,
): Promise<() => Map<string, ChannelHourRow[]>> {
  const spans = await currentReadingSpans(scope, channelIds, range.from, range.to);
  if (known) {
    for (const id of channelIds) {
      const t = known.get(id)?.t;
      if (!t || t.length === 0) continue;
      let first = Infinity;
      let last = -Infinity;
      for (let i = 0; i < t.length; i++) {
        if (t[i]! < first) first = t[i]!;
        if (t[i]! > last) last = t[i]!;
      }
      const stored = spans.get(id);
      spans.set(id, stored ? { first: Math.min(first, stored.first), last: Math.max(last, stored.last) } : { first, last });
    }
  }
  const hourSpans = new Map<string, HourRange>();
  for (const id of channelIds) {
    const hours = storedHourSpan(range, spans.get(id));
    if (hours) hourSpans.set(id, hours);
  }
  // Readings outside a channel's own span do not exist, so one load over the range serves all.
  const readings = known ?? (hourSpans.size > 0 ? await loadCurrentReadingsOf(scope, [...hourSpans.keys()], range.from, range.to) : new Map<string, ReadingColumns>());
  return () => {
    const out = new Map<string, ChannelHourRow[]>();
    const rule = validityRuleFor(ctx.regime);
    for (const id of channelIds) {
      const hours = hourSpans.get(id);
      if (!hours) {
        out.set(id, []);
        continue;
      }
      const channel = ctx.channels.find((c) => c.id === id)!;
      const columns = readings.get(id) ?? { t: new Float64Array(0), value: new Float64Array(0), status: new Uint8Array(0) };
      const rows = channelHours(columns, { fromMs: hours.from, toMs: hours.to, intervalMinutes: channel.intervalMinutes, rule });
      for (const r of rows) r.coverage = clampCoverage(r.coverage);
      out.set(id, rows);
    }
    return out;
  };
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
