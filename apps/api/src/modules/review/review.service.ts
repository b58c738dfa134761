/**
 * The data review of one stack over a period: stored hourly values of its channels and limits,
 * daily averages in the site's local calendar, each limit's verdict, data availability, invalid
 * days, exceedances, near misses and headroom (the calc compliance engine), and the O2/CO2
 * plausibility check (expected CO2 from the fuel's CO2max). Reads the stored results; a limit's
 * hours older than the limit, its channels or the fuel analysis are recomputed first.
 *
 * The hours come from the database as one array per column and go out the same way (see
 * review.schemas.ts): a month of a stack is a few dozen flat arrays, not thousands of objects.
 */
import { createHash } from 'node:crypto';
import {
  CalcInputError,
  type Evaluation,
  type ExceedanceEvent,
  HOUR_STATUSES,
  HourStatusCode,
  type HourlySeries,
  type LimitRule,
  type PeriodValue,
  allocateHourlySeries,
  evaluateLimit,
  headroom,
  isUsableHour,
  millisecondsInHour,
  o2Co2Consistency,
  parseLimitRule,
  periodAverages,
  stoichiometry,
  wetToDry,
} from '@flueledger/calc';
import { toLimitDto } from '../permits/limits.repo';
import { toDateOnly } from '../sites/db-values';
import { toLimitRule } from '../permits/limits.mapper';
import type { LimitRow } from '../permits/limits.repo';
import { toDbWord } from '../results/channel-hours';
import { planLimit } from '../results/limit-hours';
import { lockStackReadings } from '../readings/readings.store';
import { ensureHourlyPartitions } from '../results/results.repo';
import { limitHoursStale, recomputeLimitHours, wholeHours } from '../results/results.service';
import type { StackContext } from '../results/stack-context';
import { type ReviewCtx, checkRange, loadVisibleStackContext, localMonthOf, millisecondsInDay, parseInstant } from './review-access';
import {
  HOUR_REASON_LEGEND,
  HOUR_STATUS_LEGEND,
  type LimitHourRange,
  type StoredHours,
  type StoredHoursRead,
  UNKNOWN_STATUS_CODE,
  loadStoredHours,
} from './review.repo';
import type { ReviewDto, ReviewQuery } from './review.schemas';
import { toWirePrecision } from './wire-precision';

/** Longest period one review covers (a quarter): the hourly table of a longer one is a report's job. */
export const MAX_REVIEW_DAYS = 93;

/**
 * Relative deviation of measured from expected CO2 above which an hour is flagged. Site practice
 * decides the tolerance (REFERENCES.md §1 leaves it to the caller); 10 % is common practice.
 */
export const PLAUSIBILITY_TOLERANCE_PERCENT = 10;

export const REVIEW_DISCLAIMER =
  'These figures support, and do not replace, the operator’s regulatory reporting. The permit, local regulations and licensed professionals decide.';

const iso = (ms: number) => new Date(ms).toISOString();

/** How far before `from` a limit's averaging window may reach (rolling windows). */
function lookbackMs(limit: LimitRow): number {
  const n = limit.period_length ?? 0;
  if (limit.period === 'rolling_days') {
    // Operating-day windows may span more calendar days; twice the window is a bounded guess.
    return (limit.operating_periods_only ? 2 * n : n + 1) * millisecondsInDay;
  }
  if (limit.period === 'rolling_hours') return (limit.operating_periods_only ? 2 * n : n) * millisecondsInHour;
  return 0;
}

function appliesInPeriod(limit: LimitRow, from: number, to: number): boolean {
  const effectiveFrom = Date.parse(toDateOnly(limit.effective_from)!);
  const effectiveTo = limit.effective_to === null ? null : Date.parse(toDateOnly(limit.effective_to)!);
  // Dates are calendar days (read here as UTC midnight); a day of slack either side covers every time zone.
  return effectiveFrom < to + millisecondsInDay && (effectiveTo === null || effectiveTo + 2 * millisecondsInDay > from);
}

function eventDto(e: ExceedanceEvent) {
  return {
    start: iso(e.start),
    end: iso(e.end),
    peak: e.peak,
    peakAt: iso(e.peakAt),
    percentOfElv: e.peakPercentOfElv,
    threshold: e.threshold,
    periodCount: e.periodCount,
  };
}

const verdictWord = (v: Evaluation['verdict']) => toDbWord(v) as 'compliant' | 'exceedance' | 'insufficient_data';

/** Daily period statuses as sent: index = code in `daily.status` columns. */
export const DAY_STATUS_LEGEND: readonly string[] = ['valid', 'invalid', 'not_operating', 'incomplete'];
const dayStatusCode = new Map(DAY_STATUS_LEGEND.map((word, i) => [word, i]));

/**
 * Part of every entity tag: the version of how the review is computed and shaped. Several API
 * instances behind one balancer must give the same answer the same tag, so it is a constant, not
 * anything of the process: change it whenever a release changes what the same stored data
 * answer (a computation, a field, the precision sent).
 */
const TAG_EPOCH = 'review-columns-3';

export type ReviewAnswer = { etag: string; notModified: true } | { etag: string; notModified: false; review: ReviewDto };

/**
 * The review of a stack over a period, or only its entity tag when `ifNoneMatch` names it (the
 * client's copy is current: answer 304). The tag is a hash of everything the answer is made of:
 * the stack's context (site, channels, limits, fuel analysis, each with its change time), the
 * period, and per channel and limit the count and newest `computed_at` of the stored hours read
 * (a recompute replaces rows with a later `computed_at`; a removal lowers the count).
 */
export async function getReview(ctx: ReviewCtx, stackId: string, query: ReviewQuery, options: { ifNoneMatch?: string } = {}): Promise<ReviewAnswer> {
  const sc = await loadVisibleStackContext(ctx, stackId);
  const scope = { tenantId: ctx.tenantId, db: ctx.db };
  const tz = sc.timeZone;

  // --- the period ---
  let from: number;
  let to: number;
  if (query.from && query.to) {
    from = parseInstant(query.from, tz);
    to = parseInstant(query.to, tz);
  } else {
    const anchor = query.from ? parseInstant(query.from, tz) : query.to ? parseInstant(query.to, tz) - 1 : await latestHour(ctx, sc);
    ({ from, to } = localMonthOf(Number.isFinite(anchor) ? anchor : Date.now(), tz));
  }
  checkRange(from, to, MAX_REVIEW_DAYS);
  const hours = wholeHours(from, to);

  // --- stored hours: markers (and, unless the client may hold the answer, the columns too) ---
  const limits = sc.limits.filter((l) => appliesInPeriod(l, from, to));
  // Rolling limits also read the hours before the period that their first windows reach back to.
  const limitRanges: LimitHourRange[] = limits.map((l) => ({ limitId: l.id, fromMs: hours.from - lookbackMs(l) }));
  const read = (columns: boolean) =>
    loadStoredHours(scope, { channelIds: sc.channels.map((c) => c.id), limitRanges, fromMs: hours.from, toMs: hours.to, columns, derivation: query.derivation });
  const conditional = Boolean(options.ifNoneMatch);
  let stored = await read(!conditional);

  // Stale limit hours (older than the limit, its channels or the fuel analysis, or missing) are
  // recomputed first, and read again. One writer of a stack's hourly results at a time: the
  // recompute waits for an import or correction of the stack in progress (and another reader
  // recomputing), then judges again on what that left, so two writers never interleave.
  const staleLimits = (read: StoredHoursRead) =>
    limits.filter((limit) => {
      const plan = planLimit(sc, limit);
      const m = read.limits.get(limit.id);
      // Freshness is judged on the count of the period's own hours and the age of every hour read.
      const have = { count: m?.countInPeriod ?? 0, oldestComputedAt: m?.oldest ?? Infinity };
      const pollutantHours = plan.ok ? (read.channels.get(plan.inputs.pollutant.id)?.count ?? 0) : 0;
      return limitHoursStale(sc, limit, plan, have, pollutantHours);
    });
  let recomputed = false;
  if (staleLimits(stored).length > 0) {
    await lockStackReadings(ctx.db, sc.stackId);
    stored = await read(!conditional);
    for (const limit of staleLimits(stored)) {
      const loadFrom = hours.from - lookbackMs(limit);
      await ensureHourlyPartitions(scope, loadFrom, hours.to);
      await recomputeLimitHours(scope, sc, limit, { from: loadFrom, to: hours.to }, planLimit(sc, limit));
      recomputed = true;
    }
  }
  if (recomputed) stored = await read(!conditional);
  if (conditional) {
    const current = entityTag(sc, from, to, stored, query.derivation);
    if (tagMatches(options.ifNoneMatch!, current)) return { etag: current, notModified: true };
    // Read again with the columns: the tag sent is made from the same statement's markers as the
    // hours sent (one snapshot).
    stored = await read(true);
  }
  const etag = entityTag(sc, from, to, stored, query.derivation);

  // --- the engine's series, built straight from the columns ---
  const channelSeries = new Map<string, HourlySeries>();
  for (const [id, cols] of stored.channels) channelSeries.set(id, seriesFromColumns(cols, hours.from));
  const limitSeries = new Map<string, HourlySeries>();
  for (const [id, cols] of stored.limits) limitSeries.set(id, seriesFromColumns(cols, hours.from));

  // --- hourly series on the period's grid ---
  const count = (hours.to - hours.from) / millisecondsInHour;
  const hourly: ReviewDto['hourly'] = {
    fromMs: hours.from,
    stepMs: millisecondsInHour,
    count,
    statusLegend: [...HOUR_STATUS_LEGEND],
    reasonLegend: [...HOUR_REASON_LEGEND],
    channels: {},
    limits: {},
  };
  for (const c of sc.channels) {
    const cols = stored.channels.get(c.id);
    const i = cols?.i ?? [];
    const span = gridSpan(i, count);
    if (!cols || !span) continue;
    hourly.channels[c.id] = {
      value: onGrid(i, cols.value!, span, count, toWirePrecision),
      status: sparseOnGrid(i, cols.status!, span, count, 0),
      coverage: sparseOnGrid(i, cols.coverage!, span, count, 1, roundShare),
      reason: sparseOnGrid(i, cols.reason!, span, count, 0),
    };
  }
  for (const l of limits) {
    const cols = stored.limits.get(l.id);
    const i = cols?.i ?? [];
    const span = gridSpan(i, count);
    if (!cols || !span) continue;
    hourly.limits[l.id] = {
      value: onGrid(i, cols.value!, span, count, toWirePrecision),
      status: sparseOnGrid(i, cols.status!, span, count, 0),
      reason: sparseOnGrid(i, cols.reason!, span, count, 0),
      ...(query.derivation
        ? {
            o2PercentDry: onGrid(i, cols.o2PercentDry!, span, count, toWirePrecision),
            massKgPerHour: onGrid(i, cols.massKgPerHour!, span, count, toWirePrecision),
          }
        : {}),
    };
  }
  // The oldest computation behind the figures shown.
  let computedAt = Infinity;
  for (const m of stored.channels.values()) computedAt = Math.min(computedAt, m.oldest);
  for (const [id, m] of stored.limits) if (hourly.limits[id]) computedAt = Math.min(computedAt, m.oldest);

  // --- per limit: rule, evaluation, headroom ---
  const rules = new Map<string, LimitRule | null>();
  const limitDtos = limits.map((l) => toLimitDto(l));
  const limitResults: ReviewDto['limits'] = limits.map((limit, i) => {
    const dto = limitDtos[i]!;
    const plan = planLimit(sc, limit);
    let rule: LimitRule | null = null;
    try {
      rule = parseLimitRule(toLimitRule({ ...dto, summary: dto.summary }));
    } catch (error) {
      if (!(error instanceof CalcInputError)) throw error;
    }
    rules.set(limit.id, rule);
    const threshold = Number(((rule?.criterion.factor ?? 1) * dto.elv).toPrecision(12));
    const series = limitSeries.get(limit.id);
    const inPeriod = stored.limits.get(limit.id)?.countInPeriod ?? 0;
    const empty = {
      limit: dto,
      channelId: plan.ok ? plan.inputs.pollutant.id : null,
      verdict: 'insufficient_data' as const,
      threshold,
      availabilityPercent: null,
      validHours: 0,
      invalidHours: 0,
      invalidDays: 0,
      exceedances: [],
      nearMisses: [],
      share: null,
      headroom: null,
    };
    if (!plan.ok) return { ...empty, note: plan.problem };
    if (!rule) return { ...empty, note: 'The limit cannot be evaluated: its rule is incomplete (check the averaging period and criterion).' };
    if (!series || inPeriod === 0) return { ...empty, note: 'No hourly values for this limit in the period: import the stack’s data first.' };
    const evaluation = evaluateLimit(series, rule, { from, to }, { timeZone: tz });
    return {
      limit: dto,
      channelId: plan.inputs.pollutant.id,
      verdict: verdictWord(evaluation.verdict),
      note: evaluation.note,
      threshold,
      availabilityPercent: evaluation.availability.percent,
      validHours: evaluation.availability.validHours,
      invalidHours: evaluation.availability.invalidHours,
      invalidDays: evaluation.invalidDays,
      exceedances: evaluation.exceedances.map(eventDto),
      nearMisses: evaluation.nearMisses.map(eventDto),
      share: evaluation.share ?? null,
      headroom: headroomDto(series, rule, tz, from, to),
    };
  });

  // --- daily series (local calendar days) ---
  const daily = dailySeries(sc, channelSeries, limits, rules, limitSeries, tz, from, to);

  return {
    etag,
    notModified: false,
    review: {
      stack: { id: sc.stackId, name: sc.stackName, siteId: sc.siteId, siteName: sc.siteName },
      from: iso(from),
      to: iso(to),
      timeZone: tz,
      channels: sc.channels.map((c) => ({ id: c.id, parameter: c.parameter, unit: c.unit, basis: c.basis, conditions: c.conditions, intervalMinutes: c.intervalMinutes })),
      hourly,
      daily,
      limits: limitResults,
      ...plausibility(sc, channelSeries, hours.from, hours.to),
      computedAt: Number.isFinite(computedAt) ? iso(computedAt) : null,
      disclaimer: REVIEW_DISCLAIMER,
    },
  };
}

/** A strong entity tag of the review answer (see `getReview`). */
function entityTag(sc: StackContext, from: number, to: number, markers: StoredHoursRead, derivation = false): string {
  const hourMarkers = (map: StoredHoursRead['channels']) =>
    [...map].sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)).map(([id, m]) => [id, m.count, m.countInPeriod, m.oldest, m.newest, m.last]);
  // Headroom is judged as of min(now, end of period, end of data): while the data reach past
  // now, the answer changes with the clock, and so does the tag.
  let dataEnd = -Infinity;
  for (const m of markers.limits.values()) dataEnd = Math.max(dataEnd, m.last + millisecondsInHour);
  const asOf = Math.min(Date.now(), to, dataEnd);
  const hash = createHash('sha256')
    .update(JSON.stringify([TAG_EPOCH, from, to, derivation, asOf, sc, hourMarkers(markers.channels), hourMarkers(markers.limits)]))
    .digest('base64url');
  return `"${hash.slice(0, 32)}"`;
}

/** Whether an If-None-Match header names the tag (weak comparison, RFC 9110 §13.1.2). */
export function tagMatches(ifNoneMatch: string, etag: string): boolean {
  if (ifNoneMatch.trim() === '*') return true;
  return ifNoneMatch.split(',').some((candidate) => candidate.trim().replace(/^W\//, '') === etag);
}

/** Index range [first, last) of the entries whose hour lies on the grid [0, count); null when none. */
function gridSpan(offsets: readonly number[], count: number): [number, number] | null {
  let first = 0;
  while (first < offsets.length && offsets[first]! < 0) first++;
  let last = first;
  while (last < offsets.length && offsets[last]! < count) last++;
  return last > first ? [first, last] : null;
}

/**
 * One stored column placed on the grid of `count` hours, null where no hour is stored, each entry
 * passed through `map` when given. The common case, every hour stored, is the column itself (the
 * engine's series are copies, so nothing else reads it afterwards) or one pass over it.
 */
function onGrid<T>(offsets: readonly number[], column: T[], [first, last]: [number, number], count: number, map?: (v: T) => T): (T | null)[] {
  if (last - first === count) {
    if (!map) return first === 0 && last === column.length ? column : column.slice(first, last);
    const out = new Array<T>(count);
    for (let k = 0; k < count; k++) out[k] = map(column[first + k]!);
    return out;
  }
  const out = new Array<T | null>(count).fill(null);
  for (let k = first; k < last; k++) out[offsets[k]!] = map ? map(column[k]!) : column[k]!;
  return out;
}

/**
 * One stored column placed on the grid of `count` hours as its exceptions (review.schemas.ts
 * `SparseColumn`): the hours whose entry is not `usual`, null where no hour is stored.
 */
function sparseOnGrid(
  offsets: readonly number[],
  column: readonly (number | null)[],
  [first, last]: [number, number],
  count: number,
  usual: number,
  map?: (v: number | null) => number | null,
): { usual: number; at: number[]; values: (number | null)[] } {
  const at: number[] = [];
  const values: (number | null)[] = [];
  let next = 0; // the next grid hour not yet accounted for
  for (let k = first; k < last; k++) {
    const hour = offsets[k]!;
    for (; next < hour; next++) {
      at.push(next);
      values.push(null);
    }
    const v = map ? map(column[k] ?? null) : (column[k] ?? null);
    if (v !== usual) {
      at.push(hour);
      values.push(v);
    }
    next = hour + 1;
  }
  for (; next < count; next++) {
    at.push(next);
    values.push(null);
  }
  return { usual, at, values };
}

/** Shares are shown to 0.1 %: more digits only cost bytes. */
const roundShare = (share: number | null): number | null => (share === null ? null : Math.round(share * 1000) / 1000);

const usableCodes = new Set<number>([HourStatusCode.valid, HourStatusCode.substituted]);

/**
 * The engine's series of stored hours (sparse: only hours with a row, as stored). A usable hour
 * always has a number; a stray null makes it invalid rather than breaking a whole review.
 */
function seriesFromColumns(hours: StoredHours, originMs: number): HourlySeries {
  const cols = { i: hours.i ?? [], value: hours.value ?? [], status: hours.status ?? [], reason: hours.reason ?? [], coverage: hours.coverage };
  const n = cols.i.length;
  const s = allocateHourlySeries(n, millisecondsInHour);
  for (let k = 0; k < n; k++) {
    const code = cols.status[k]!;
    if (code === UNKNOWN_STATUS_CODE || code >= HOUR_STATUSES.length) {
      throw new CalcInputError(`A stored hour has a status outside ${HOUR_STATUS_LEGEND.join(', ')}.`, 'status');
    }
    const v = cols.value[k];
    const value = v === null || v === undefined || !Number.isFinite(v) ? NaN : v;
    s.t[k] = originMs + cols.i[k]! * millisecondsInHour;
    s.value[k] = value;
    s.status[k] = usableCodes.has(code) && Number.isNaN(value) ? HourStatusCode.invalid : code;
    s.reason[k] = cols.reason[k] ?? 0;
    const c = cols.coverage?.[k];
    s.coverage[k] = c === null || c === undefined ? NaN : c;
  }
  return s;
}

/** Start of the latest stored hour of the stack's channels (or now). */
async function latestHour(ctx: ReviewCtx, sc: StackContext): Promise<number> {
  if (sc.channels.length === 0) return Date.now();
  const { rows } = await ctx.db.raw(
    'select (extract(epoch from max(hour_start)) * 1000)::float8 as h from hourly_values where tenant_id = ? and channel_id = any(?::uuid[])',
    [ctx.tenantId, sc.channels.map((c) => c.id)],
  );
  return (rows[0]?.h as number | null) ?? Date.now();
}

/**
 * Headroom of the rule's period in progress at the end of the data (or now), when that lies
 * inside the review period: how high the remaining hours may average and stay compliant.
 */
function headroomDto(series: HourlySeries, rule: LimitRule, tz: string, from: number, to: number): ReviewDto['limits'][number]['headroom'] {
  const n = series.t.length;
  if (n === 0) return null;
  const dataEnd = series.t[n - 1]! + series.periodMs;
  const asOf = Math.min(Date.now(), to, dataEnd);
  if (!(asOf > from && asOf < to)) return null;
  const h = headroom(series, rule, { timeZone: tz, asOf });
  return {
    asOf: iso(asOf),
    periodStart: iso(h.periodStart),
    periodEnd: iso(h.periodEnd),
    remainingHours: h.remainingHours,
    averageSoFar: h.averageSoFar,
    maxAverageToStayCompliant: h.maxAverageRemaining,
    exceedanceCertain: h.exceedanceCertain,
    periodsAboveAllowedRemaining: h.periodsAboveAllowedRemaining ?? null,
    note: h.note ?? null,
  };
}

function dailySeries(
  sc: StackContext,
  channelSeries: ReadonlyMap<string, HourlySeries>,
  limits: readonly LimitRow[],
  rules: ReadonlyMap<string, LimitRule | null>,
  limitSeries: ReadonlyMap<string, HourlySeries>,
  tz: string,
  from: number,
  to: number,
): ReviewDto['daily'] {
  const dayEnds = new Map<number, number>();
  const channelDays = new Map<string, readonly PeriodValue[]>();
  const limitDays = new Map<string, readonly PeriodValue[]>();
  for (const c of sc.channels) {
    const s = channelSeries.get(c.id);
    if (!s || s.t.length === 0) continue;
    channelDays.set(c.id, periodAverages(s, { period: 'day', timeZone: tz, from, to }));
  }
  for (const limit of limits) {
    const s = limitSeries.get(limit.id);
    const rule = rules.get(limit.id);
    if (!s || s.t.length === 0 || !rule) continue;
    limitDays.set(
      limit.id,
      periodAverages(s, {
        period: 'day',
        timeZone: tz,
        from,
        to,
        confidenceInterval: (rule.confidenceIntervalPercent / 100) * rule.elv,
        excludeStatuses: rule.excludeStatuses,
        ...(rule.minData ? { minData: rule.minData } : {}),
      }),
    );
  }
  for (const periods of [...channelDays.values(), ...limitDays.values()]) for (const p of periods) dayEnds.set(p.start, p.end);
  const starts = [...dayEnds.keys()].sort((a, b) => a - b);
  const index = new Map(starts.map((start, k) => [start, k]));
  const n = starts.length;
  const column = () => new Array<number | null>(n).fill(null);
  const daily: ReviewDto['daily'] = {
    dayStart: starts.map(iso),
    dayEnd: starts.map((start) => iso(dayEnds.get(start)!)),
    statusLegend: [...DAY_STATUS_LEGEND],
    channels: {},
    limits: {},
  };
  for (const [id, periods] of channelDays) {
    const cols = { value: column(), status: column(), coverage: column(), validHours: column(), invalidHours: column() };
    for (const p of periods) {
      const k = index.get(p.start)!;
      const operating = p.validHours + p.invalidHours;
      cols.value[k] = p.measuredValue;
      cols.status[k] = dayStatus(p);
      cols.coverage[k] = operating ? roundShare(p.validHours / operating) : null;
      cols.validHours[k] = p.validHours;
      cols.invalidHours[k] = p.invalidHours;
    }
    daily.channels[id] = cols;
  }
  for (const [id, periods] of limitDays) {
    const cols = { value: column(), validatedValue: column(), status: column(), validHours: column(), invalidHours: column() };
    for (const p of periods) {
      const k = index.get(p.start)!;
      cols.value[k] = p.measuredValue;
      cols.validatedValue[k] = p.value;
      cols.status[k] = dayStatus(p);
      cols.validHours[k] = p.validHours;
      cols.invalidHours[k] = p.invalidHours;
    }
    daily.limits[id] = cols;
  }
  return daily;
}

function dayStatus(p: PeriodValue): number {
  const code = dayStatusCode.get(toDbWord(p.status));
  if (code === undefined) throw new Error(`Daily status ${p.status} is missing from the legend.`);
  return code;
}

/** O2/CO2 plausibility: hours whose measured CO2 deviates from CO2max·(20.9 − O2)/20.9 by more than the tolerance. */
function plausibility(sc: StackContext, channelSeries: ReadonlyMap<string, HourlySeries>, from: number, to: number): Pick<ReviewDto, 'plausibility' | 'plausibilityCheck'> {
  const flagged: ReviewDto['plausibility'] = [];
  const check = { co2MaxPercentDry: null as number | null, tolerancePercent: PLAUSIBILITY_TOLERANCE_PERCENT, hoursChecked: 0, note: null as string | null };
  const pickChannel = (p: string) => sc.channels.find((c) => c.parameter === p && c.unit === '%' && c.basis === 'dry') ?? sc.channels.find((c) => c.parameter === p && c.unit === '%');
  const o2 = pickChannel('O2');
  const co2 = pickChannel('CO2');
  const h2o = pickChannel('H2O');
  if (!o2 || !co2) return { plausibility: flagged, plausibilityCheck: { ...check, note: 'Needs both an O2 and a CO2 channel.' } };
  if (!sc.fuel?.fuel) return { plausibility: flagged, plausibilityCheck: { ...check, note: 'Needs the fuel’s analysis (composition or ultimate analysis) for its CO2max.' } };
  let co2Max: number;
  try {
    co2Max = stoichiometry(sc.fuel.fuel).co2MaxPercentDry;
  } catch (error) {
    if (!(error instanceof CalcInputError)) throw error;
    return { plausibility: flagged, plausibilityCheck: { ...check, note: `The fuel analysis gives no CO2max: ${error.message}` } };
  }
  check.co2MaxPercentDry = co2Max;
  const o2s = channelSeries.get(o2.id);
  const co2s = channelSeries.get(co2.id);
  const h2os = h2o ? channelSeries.get(h2o.id) : undefined;
  if (!o2s || !co2s) return { plausibility: flagged, plausibilityCheck: check };
  const index = (s: HourlySeries | undefined) => (s ? new Map(Array.from(s.t, (t, i) => [t, i])) : new Map<number, number>());
  const co2At = index(co2s);
  const h2oAt = index(h2os);
  const dry = (s: HourlySeries, i: number, basis: string, t: number): number => {
    const v = s.value[i]!;
    if (basis === 'dry') return v;
    const j = h2oAt.get(t);
    return h2os && j !== undefined && isUsableHour(h2os, j) ? wetToDry(v, h2os.value[j]!) : NaN;
  };
  for (let i = 0; i < o2s.t.length; i++) {
    const t = o2s.t[i]!;
    if (t < from || t >= to || !isUsableHour(o2s, i)) continue;
    const j = co2At.get(t);
    if (j === undefined || !isUsableHour(co2s, j)) continue;
    const o2Dry = dry(o2s, i, o2.basis, t);
    const co2Dry = dry(co2s, j, co2.basis, t);
    if (!(o2Dry >= 0 && o2Dry <= 20.9 && co2Dry >= 0)) continue;
    const r = o2Co2Consistency({ o2PercentDry: o2Dry, co2PercentDry: co2Dry, co2MaxPercentDry: co2Max });
    check.hoursChecked++;
    if (Math.abs(r.deviationRelativePercent) > PLAUSIBILITY_TOLERANCE_PERCENT) {
      flagged.push({ hourStart: iso(t), o2PercentDry: o2Dry, expectedCo2PercentDry: r.expectedCo2PercentDry, measuredCo2PercentDry: co2Dry, deviationPercent: r.deviationRelativePercent });
    }
  }
  return { plausibility: flagged, plausibilityCheck: check };
}

