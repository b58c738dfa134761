/**
 * The data review of one stack over a period: stored hourly values of its channels and limits,
 * daily averages in the site's local calendar, each limit's verdict, data availability, invalid
 * days, exceedances, near misses and headroom (the calc compliance engine), and the O2/CO2
 * plausibility check (expected CO2 from the fuel's CO2max). Reads the stored results; a limit's
 * hours older than the limit, its channels or the fuel analysis are recomputed first.
 */
import {
  CalcInputError,
  type Evaluation,
  type ExceedanceEvent,
  type HourlySeries,
  type LimitRule,
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
import { seriesFromStoredHours, toDbWord } from '../results/channel-hours';
import { planLimit } from '../results/limit-hours';
import { type StoredChannelHour, type StoredLimitHour, ensureHourlyPartitions, loadChannelHours, loadLimitHours } from '../results/results.repo';
import { limitHoursStale, recomputeLimitHours, wholeHours } from '../results/results.service';
import { type StackContext, loadStackContext } from '../results/stack-context';
import { type ReviewCtx, checkRange, findVisibleStack, localMonthOf, millisecondsInDay, parseInstant } from './review-access';
import type { ReviewDto, ReviewQuery } from './review.schemas';

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

function groupBy<T extends { [k in K]: string }, K extends string>(rows: readonly T[], key: K): Map<string, T[]> {
  const out = new Map<string, T[]>();
  for (const r of rows) {
    let list = out.get(r[key]);
    if (!list) out.set(r[key], (list = []));
    list.push(r);
  }
  return out;
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

export async function getReview(ctx: ReviewCtx, stackId: string, query: ReviewQuery): Promise<ReviewDto> {
  const visible = await findVisibleStack(ctx, stackId);
  const scope = { tenantId: ctx.tenantId, db: ctx.db };
  const sc = (await loadStackContext(scope, stackId))!;
  const tz = sc.timeZone || visible.time_zone;

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

  // --- stored hourly values (recomputing stale limit hours first) ---
  const limits = sc.limits.filter((l) => appliesInPeriod(l, from, to));
  const channelIds = sc.channels.map((c) => c.id);
  // One connection per transaction: queries run one after the other. Rolling limits also read
  // the hours before the period that their first windows reach back to.
  const channelRows = await loadChannelHours(scope, channelIds, hours.from, hours.to);
  const limitRowsAll = await loadLimitHours(
    scope,
    limits.filter((l) => lookbackMs(l) === 0).map((l) => l.id),
    hours.from,
    hours.to,
  );
  for (const l of limits.filter((x) => lookbackMs(x) > 0)) limitRowsAll.push(...(await loadLimitHours(scope, [l.id], hours.from - lookbackMs(l), hours.to)));
  const channelHoursById = groupBy(channelRows, 'channelId');
  const limitHoursById = groupBy(limitRowsAll, 'limitId');
  for (const limit of limits) {
    const plan = planLimit(sc, limit);
    // Freshness is judged on the period's own hours; a recompute covers the look-back too.
    const stored = (limitHoursById.get(limit.id) ?? []).filter((r) => r.hourStart >= hours.from);
    const pollutantHours = plan.ok ? (channelHoursById.get(plan.inputs.pollutant.id)?.length ?? 0) : 0;
    const oldest = stored.reduce((m, r) => Math.min(m, r.computedAt), Infinity);
    if (!limitHoursStale(sc, limit, plan, { count: stored.length, oldestComputedAt: oldest }, pollutantHours)) continue;
    const loadFrom = hours.from - lookbackMs(limit);
    await ensureHourlyPartitions(scope, loadFrom, hours.to);
    await recomputeLimitHours(scope, sc, limit, { from: loadFrom, to: hours.to }, plan);
    limitHoursById.set(limit.id, await loadLimitHours(scope, [limit.id], loadFrom, hours.to));
  }

  // --- engine series ---
  const channelSeries = new Map<string, HourlySeries>();
  for (const [id, rows] of channelHoursById) channelSeries.set(id, seriesFromStoredHours(rows));
  const limitSeries = new Map<string, HourlySeries>();
  for (const [id, rows] of limitHoursById) limitSeries.set(id, seriesFromStoredHours(rows));

  // --- hourly table ---
  const hourly: ReviewDto['hourly'] = [];
  const hourIndex = new Map<number, number>();
  for (let h = hours.from; h < hours.to; h += millisecondsInHour) {
    hourIndex.set(h, hourly.length);
    hourly.push({ hourStart: iso(h), channels: {}, limits: {} });
  }
  // The oldest computation behind the figures shown.
  let computedAt = Infinity;
  for (const r of channelRows) {
    const k = hourIndex.get(r.hourStart);
    if (k === undefined) continue;
    hourly[k]!.channels[r.channelId] = { value: r.value, status: r.status, coverage: r.coverage, reason: r.reason };
    computedAt = Math.min(computedAt, r.computedAt);
  }
  for (const [limitId, rows] of limitHoursById) {
    for (const r of rows) {
      const k = hourIndex.get(r.hourStart);
      if (k === undefined) continue;
      hourly[k]!.limits[limitId] = { value: r.value, status: r.status, reason: r.reason, o2PercentDry: r.o2PercentDry, massKgPerHour: r.massKgPerHour };
      computedAt = Math.min(computedAt, r.computedAt);
    }
  }

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
    const inPeriod = (limitHoursById.get(limit.id) ?? []).filter((r) => r.hourStart >= hours.from).length;
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
  };
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
  const days = new Map<number, ReviewDto['daily'][number]>();
  const day = (start: number, end: number) => {
    let d = days.get(start);
    if (!d) days.set(start, (d = { dayStart: iso(start), dayEnd: iso(end), channels: {}, limits: {} }));
    return d;
  };
  for (const c of sc.channels) {
    const s = channelSeries.get(c.id);
    if (!s || s.t.length === 0) continue;
    for (const p of periodAverages(s, { period: 'day', timeZone: tz, from, to })) {
      const operating = p.validHours + p.invalidHours;
      day(p.start, p.end).channels[c.id] = {
        value: p.measuredValue,
        status: toDbWord(p.status),
        coverage: operating ? p.validHours / operating : null,
        validHours: p.validHours,
        invalidHours: p.invalidHours,
      };
    }
  }
  for (const limit of limits) {
    const s = limitSeries.get(limit.id);
    const rule = rules.get(limit.id);
    if (!s || s.t.length === 0 || !rule) continue;
    const periods = periodAverages(s, {
      period: 'day',
      timeZone: tz,
      from,
      to,
      confidenceInterval: (rule.confidenceIntervalPercent / 100) * rule.elv,
      excludeStatuses: rule.excludeStatuses,
      ...(rule.minData ? { minData: rule.minData } : {}),
    });
    for (const p of periods) {
      day(p.start, p.end).limits[limit.id] = {
        value: p.measuredValue,
        validatedValue: p.value,
        status: toDbWord(p.status),
        validHours: p.validHours,
        invalidHours: p.invalidHours,
      };
    }
  }
  return [...days.values()].sort((a, b) => a.dayStart.localeCompare(b.dayStart));
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

export type { StoredChannelHour, StoredLimitHour };
