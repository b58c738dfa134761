/**
 * Evaluation of a limit rule over an interval: per-period values with status and traceability,
 * the verdict, exceedance and near-miss events, data availability and invalid days.
 */
import { type PeriodValue, blockAverages, dayStats, periodAverages, prepareHours, rollingAverages, HourClass, firstIndexAtOrAfter } from '../averaging';
import { CalcInputError } from '../errors';
import type { HourlySeries } from '../hourly/series';
import { type LimitRule, type LimitRuleInput, parseLimitRule } from '../limits';
import { assertTimeZone } from '../periods';

/** Interval of an evaluation, UTC ms [from, to) — for the IED 95 % rule, one calendar year. */
export interface EvaluationInterval {
  readonly from: number;
  readonly to: number;
}

export interface EvaluateOptions {
  /** The site's IANA time zone. */
  readonly timeZone: string;
  /** End of the data received so far; later periods are `incomplete`. Default: end of the series. */
  readonly dataEnd?: number;
}

/** compliant | exceedance | insufficient-data (not enough valid data to decide). */
export type Verdict = 'compliant' | 'exceedance' | 'insufficient-data';

/** How one period compares with the criterion. */
export type PeriodOutcome = 'within' | 'near-miss' | 'above' | 'not-assessed';

export interface EvaluatedPeriod extends PeriodValue {
  /** factor × ELV, in the rule's unit. */
  readonly threshold: number;
  /** value / ELV × 100; null without a value. */
  readonly percentOfElv: number | null;
  readonly outcome: PeriodOutcome;
}

/**
 * A run of consecutive periods above the threshold (or in the near-miss band). For a
 * share-of-periods criterion, periods above the threshold are `above-threshold` events: each
 * is allowed as long as the share holds.
 */
export interface ExceedanceEvent {
  readonly kind: 'exceedance' | 'near-miss' | 'above-threshold';
  /** Stable key of the event (rule, kind, start) for notifying exactly once. */
  readonly key: string;
  readonly start: number;
  readonly end: number;
  readonly durationMs: number;
  readonly peak: number;
  /** Start of the period holding the peak. */
  readonly peakAt: number;
  readonly peakPercentOfElv: number;
  readonly threshold: number;
  /** Indices [periodFrom, periodTo] into `Evaluation.periods`. */
  readonly periodFrom: number;
  readonly periodTo: number;
  readonly periodCount: number;
}

export interface DataAvailability {
  readonly validHours: number;
  /** Operating hours without valid data. */
  readonly invalidHours: number;
  /** Start-up/shut-down and other excluded hours. */
  readonly excludedHours: number;
  /** validHours + invalidHours. */
  readonly operatingHours: number;
  /** validHours / operatingHours × 100; null without operating hours. */
  readonly percent: number | null;
}

export interface ShareResult {
  /** Required share of valid periods ≤ threshold (e.g. 0.95). */
  readonly required: number;
  /** Achieved share; null without valid periods. */
  readonly achieved: number | null;
  readonly validPeriods: number;
  readonly periodsAbove: number;
  /** How many valid periods may be above the threshold with this many valid periods. */
  readonly allowedAbove: number;
}

export interface Evaluation {
  readonly rule: LimitRule;
  readonly interval: EvaluationInterval;
  readonly verdict: Verdict;
  /** Why, in words. */
  readonly note: string;
  readonly periods: readonly EvaluatedPeriod[];
  readonly exceedances: readonly ExceedanceEvent[];
  readonly nearMisses: readonly ExceedanceEvent[];
  /** For share-of-periods criteria. */
  readonly share?: ShareResult;
  readonly availability: DataAvailability;
  /** Local days with more invalid hours than the rule allows (or, without that rule, operating days with no valid hour). */
  readonly invalidDays: number;
}

/** Relative tolerance so that a value equal to the threshold up to rounding is not an exceedance. */
const EQUAL_TOLERANCE = 1e-12;

/** Periods of the rule over the interval (shared with headroom). */
export function rulePeriods(series: HourlySeries, rule: LimitRule, from: number, to: number, timeZone: string, dataEnd?: number): PeriodValue[] {
  const common = {
    timeZone,
    from,
    to,
    confidenceInterval: (rule.confidenceIntervalPercent / 100) * rule.elv,
    excludeStatuses: rule.excludeStatuses,
    ...(rule.minData ? { minData: rule.minData } : {}),
    ...(dataEnd !== undefined ? { dataEnd } : {}),
  };
  const p = rule.period;
  switch (p.kind) {
    case 'hour':
    case 'half-hour':
    case 'day':
    case 'month':
    case 'year':
      return periodAverages(series, { ...common, period: p.kind });
    case 'rolling-days':
      return rollingAverages(series, { ...common, window: { kind: 'days', days: p.days, operatingOnly: p.operatingDaysOnly } });
    case 'rolling-hours':
      return rollingAverages(series, { ...common, window: { kind: 'hours', hours: p.hours, operatingOnly: p.operatingHoursOnly } });
    case 'block-hours':
      return blockAverages(series, { ...common, hours: p.hours });
  }
}

/** Accepts a parsed rule or a rule input (parsed and validated here). */
export function asLimitRule(rule: LimitRule | LimitRuleInput): LimitRule {
  return parseLimitRule(rule);
}

/**
 * Evaluates a limit rule against hourly values already on the rule's basis (dry, standard
 * conditions, corrected to its reference O2 — see `deriveHourlyValues`).
 *
 * Validated values subtract `confidenceIntervalPercent` of the ELV from each valid hourly value,
 * floor 0 (IED Annex V Part 3 point 10); periods and windows follow the rule; each valid period
 * is compared with factor × ELV. Incomplete periods (in progress, window not yet full) are not
 * assessed. The verdict is `exceedance` when a period is above (every-period) or the share fails
 * (share-of-periods), `insufficient-data` when the unit operated but no period is valid, else
 * `compliant`.
 *
 * @example
 * const [monthly] = iedLcpRules({ pollutant: 'NOx', elvMgPerNm3: 100, referenceO2Percent: 3 });
 * evaluateLimit(hourly, monthly, { from, to }, { timeZone: 'Europe/Berlin' }).verdict //=> 'compliant'
 */
export function evaluateLimit(series: HourlySeries, ruleInput: LimitRule | LimitRuleInput, interval: EvaluationInterval, opts: EvaluateOptions): Evaluation {
  const rule = asLimitRule(ruleInput);
  assertTimeZone(opts.timeZone);
  const { from, to } = interval;
  if (!(Number.isFinite(from) && Number.isFinite(to) && from < to)) throw new CalcInputError('The evaluation interval needs finite from < to (UTC epoch ms).', 'interval');
  // Rounded to 12 significant digits so that 1.1 × 100 reads 110, not 110.00000000000001.
  const threshold = Number((rule.criterion.factor * rule.elv).toPrecision(12));
  const nearFrom = rule.nearMissPercent !== undefined ? (rule.nearMissPercent / 100) * threshold : Infinity;
  const above = threshold * (1 + EQUAL_TOLERANCE);

  const raw = rulePeriods(series, rule, from, to, opts.timeZone, opts.dataEnd);
  const periods: EvaluatedPeriod[] = raw.map((p) => {
    let outcome: PeriodOutcome = 'not-assessed';
    if (p.status === 'valid' && p.value !== null) outcome = p.value > above ? 'above' : p.value >= nearFrom ? 'near-miss' : 'within';
    // An explicit literal (not a spread): thousands of hourly periods keep one object shape.
    return {
      start: p.start,
      end: p.end,
      windowStart: p.windowStart,
      value: p.value,
      measuredValue: p.measuredValue,
      status: p.status,
      note: p.note,
      validHours: p.validHours,
      invalidHours: p.invalidHours,
      excludedHours: p.excludedHours,
      notOperatingHours: p.notOperatingHours,
      totalHours: p.totalHours,
      invalidDays: p.invalidDays,
      hourFrom: p.hourFrom,
      hourTo: p.hourTo,
      threshold,
      percentOfElv: p.value === null ? null : (100 * p.value) / rule.elv,
      outcome,
    };
  });

  const ruleKey = rule.id ?? `${rule.pollutant}-${rule.period.kind}`;
  const shareCriterion = rule.criterion.kind === 'share-of-periods';
  const exceedances = runs(periods, 'above', shareCriterion ? 'above-threshold' : 'exceedance', rule, ruleKey);
  const nearMisses = runs(periods, 'near-miss', 'near-miss', rule, ruleKey);

  // Availability and invalid days over the interval's hours.
  const prepared = prepareHours(series, { excludeStatuses: rule.excludeStatuses });
  let validHours = 0;
  let invalidHours = 0;
  let excludedHours = 0;
  for (let i = firstIndexAtOrAfter(series.t, from); i < series.t.length && series.t[i]! < to; i++) {
    const c = prepared.cls[i];
    if (c === HourClass.Usable) validHours++;
    else if (c === HourClass.Invalid) invalidHours++;
    else if (c === HourClass.Excluded) excludedHours++;
  }
  const operatingHours = validHours + invalidHours;
  const availability: DataAvailability = {
    validHours,
    invalidHours,
    excludedHours,
    operatingHours,
    percent: operatingHours ? (100 * validHours) / operatingHours : null,
  };
  const days = dayStats(series, prepared, from, to, opts.timeZone);
  const maxInvalid = rule.minData?.maxInvalidHoursPerDay;
  let invalidDays = 0;
  for (let k = 0; k < days.start.length; k++) {
    if (days.start[k]! < from) continue;
    if (maxInvalid !== undefined ? days.invalid[k]! > maxInvalid : days.valid[k] === 0 && days.invalid[k]! > 0) invalidDays++;
  }

  const assessed = periods.filter((p) => p.outcome !== 'not-assessed');
  const invalidPeriods = periods.filter((p) => p.status === 'invalid').length;
  let verdict: Verdict;
  let note: string;
  let share: ShareResult | undefined;
  if (rule.criterion.kind === 'share-of-periods') {
    const n = assessed.length;
    const nAbove = assessed.filter((p) => p.outcome === 'above').length;
    const allowedAbove = Math.floor((1 - rule.criterion.share) * n + 1e-9);
    share = { required: rule.criterion.share, achieved: n ? (n - nAbove) / n : null, validPeriods: n, periodsAbove: nAbove, allowedAbove };
    if (n === 0) {
      verdict = operatingHours ? 'insufficient-data' : 'compliant';
      note = operatingHours ? 'no valid period to assess' : 'the unit did not operate in the interval';
    } else if (nAbove > allowedAbove) {
      verdict = 'exceedance';
      note = `${nAbove} of ${n} valid periods above ${fmt(rule.criterion.factor * 100)} % of the ELV; at most ${allowedAbove} allowed (${fmt(rule.criterion.share * 100)} % must be within)`;
    } else {
      verdict = 'compliant';
      note = `${nAbove} of ${n} valid periods above ${fmt(rule.criterion.factor * 100)} % of the ELV; ${allowedAbove} allowed`;
    }
  } else if (exceedances.length) {
    verdict = 'exceedance';
    note = `${assessed.filter((p) => p.outcome === 'above').length} period(s) above ${fmt(rule.criterion.factor * 100)} % of the ELV`;
  } else if (assessed.length === 0) {
    verdict = operatingHours ? 'insufficient-data' : 'compliant';
    note = operatingHours ? 'no valid period to assess' : 'the unit did not operate in the interval';
  } else {
    verdict = 'compliant';
    note = `${assessed.length} valid period(s) within ${fmt(rule.criterion.factor * 100)} % of the ELV`;
  }
  if (invalidPeriods && verdict !== 'insufficient-data') note += `; ${invalidPeriods} period(s) invalid for lack of valid data`;
  return { rule, interval, verdict, note, periods, exceedances, nearMisses, ...(share ? { share } : {}), availability, invalidDays };
}

function fmt(x: number): string {
  return String(Math.round(x * 100) / 100);
}

function runs(periods: readonly EvaluatedPeriod[], outcome: PeriodOutcome, kind: ExceedanceEvent['kind'], rule: LimitRule, ruleKey: string): ExceedanceEvent[] {
  const out: ExceedanceEvent[] = [];
  let k = 0;
  while (k < periods.length) {
    if (periods[k]!.outcome !== outcome) {
      k++;
      continue;
    }
    const first = k;
    let peakK = k;
    while (k + 1 < periods.length && periods[k + 1]!.outcome === outcome) {
      k++;
      if (periods[k]!.value! > periods[peakK]!.value!) peakK = k;
    }
    const a = periods[first]!;
    const b = periods[k]!;
    const peak = periods[peakK]!.value!;
    out.push({
      kind,
      key: `${ruleKey}:${kind}:${new Date(a.start).toISOString()}`,
      start: a.start,
      end: b.end,
      durationMs: b.end - a.start,
      peak,
      peakAt: periods[peakK]!.start,
      peakPercentOfElv: (100 * peak) / rule.elv,
      threshold: a.threshold,
      periodFrom: first,
      periodTo: k,
      periodCount: k - first + 1,
    });
    k++;
  }
  return out;
}
