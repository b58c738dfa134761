/**
 * Headroom of a period in progress: how high the average of the remaining hours may be for
 * the period (calendar, block or rolling window) to stay compliant, and whether an exceedance
 * is already certain. What a plant manager needs mid-month.
 */
import { HourClass, dayStats, firstIndexAtOrAfter, prepareHours } from '../averaging';
import { type LimitRule, type LimitRuleInput, parseLimitRule } from '../limits';
import { CalcInputError } from '../errors';
import type { HourlySeries } from '../hourly/series';
import { assertTimeZone, nextLocalPeriodStart, startOfLocalPeriod } from '../periods';

export interface HeadroomOptions {
  /** The site's IANA time zone. */
  readonly timeZone: string;
  /** Data are complete up to this instant (UTC ms); the period in progress is the one containing it. */
  readonly asOf: number;
  /**
   * Valid hours still expected in the period; default: every hour from `asOf` to the period's
   * end (the most favourable assumption — fewer hours leave less room).
   */
  readonly remainingValidHours?: number;
}

export interface Headroom {
  readonly rule: LimitRule;
  /** Reporting slot of the period in progress [start, end), and the start of its averaging window. */
  readonly periodStart: number;
  readonly periodEnd: number;
  readonly windowStart: number;
  /** factor × ELV. */
  readonly limit: number;
  readonly validHoursSoFar: number;
  readonly invalidHoursSoFar: number;
  /** Mean of the validated hourly values so far; null without any. */
  readonly averageSoFar: number | null;
  readonly remainingHours: number;
  /**
   * Highest average of the measured hourly values (before the confidence interval is subtracted)
   * over the remaining hours that keeps the period within the limit; null when an exceedance is
   * already certain or no hours remain.
   */
  readonly maxAverageRemaining: number | null;
  /** The same on the validated scale (after subtracting the confidence interval). */
  readonly maxValidatedAverageRemaining: number | null;
  /** True when even zero emissions in the remaining hours cannot bring the period within the limit. */
  readonly exceedanceCertain: boolean;
  /** For share-of-periods criteria: periods above the threshold still allowed (negative: already exceeded). */
  readonly periodsAboveAllowedRemaining?: number;
  readonly note?: string;
}

/**
 * Headroom for the period of `rule` in progress at `asOf`.
 *
 * With S the sum and n the count of validated hourly values so far, R the remaining valid hours
 * and L = factor × ELV, the period average is (S + R·x)/(n + R); it stays ≤ L while the validated
 * average x of the remaining hours is ≤ (L·(n + R) − S)/R. Validated values are measured values
 * minus the confidence interval, floor 0 (IED Annex V Part 3 point 10), so the measured headroom
 * is x + CI when x > 0 (exact when the remaining hours are filled evenly: an hour below the CI
 * still counts as 0, not negative); when x < 0 no remaining hours can help: an exceedance is certain.
 *
 * For share-of-periods criteria (95 % of hours ≤ 200 % ELV) the period is the local calendar year
 * and the answer is how many more hours may be above the threshold.
 */
export function headroom(series: HourlySeries, ruleInput: LimitRule | LimitRuleInput, opts: HeadroomOptions): Headroom {
  const rule = parseLimitRule(ruleInput);
  assertTimeZone(opts.timeZone);
  const asOf = opts.asOf;
  if (!Number.isFinite(asOf)) throw new CalcInputError('asOf must be a UTC epoch ms timestamp.', 'asOf');
  const tz = opts.timeZone;
  const hourMs = series.periodMs || 3_600_000;
  const ciAbs = (rule.confidenceIntervalPercent / 100) * rule.elv;
  // Rounded to 12 significant digits so that 1.1 × 100 reads 110, not 110.00000000000001.
  const limit = Number((rule.criterion.factor * rule.elv).toPrecision(12));
  const p = prepareHours(series, { confidenceInterval: ciAbs, excludeStatuses: rule.excludeStatuses });

  // The period in progress and the start of its averaging window.
  let periodStart: number;
  let periodEnd: number;
  let windowStart: number;
  const period = rule.criterion.kind === 'share-of-periods' ? { kind: 'year' as const } : rule.period;
  switch (period.kind) {
    case 'hour':
    case 'half-hour':
      periodStart = Math.floor(asOf / hourMs) * hourMs;
      periodEnd = periodStart + hourMs;
      windowStart = periodStart;
      break;
    case 'day':
    case 'month':
    case 'year':
      periodStart = startOfLocalPeriod(asOf, period.kind, tz);
      periodEnd = nextLocalPeriodStart(periodStart, period.kind, tz);
      windowStart = periodStart;
      break;
    case 'block-hours': {
      const dayStart = startOfLocalPeriod(asOf, 'day', tz);
      const dayEnd = nextLocalPeriodStart(dayStart, 'day', tz);
      const blockMs = period.hours * 3_600_000;
      periodStart = dayStart + Math.floor((asOf - dayStart) / blockMs) * blockMs;
      periodEnd = Math.min(periodStart + blockMs, dayEnd);
      windowStart = periodStart;
      break;
    }
    case 'rolling-days': {
      periodStart = startOfLocalPeriod(asOf, 'day', tz);
      periodEnd = nextLocalPeriodStart(periodStart, 'day', tz);
      windowStart = periodStart;
      // The N − 1 preceding (operating) days.
      if (series.t.length && series.t[0]! < periodStart) {
        const days = dayStats(series, p, series.t[0]!, periodStart, tz);
        let need = period.days - 1;
        for (let k = days.start.length - 1; k >= 0 && need > 0; k--) {
          if (days.start[k]! >= periodStart) continue;
          const operated = days.valid[k]! + days.invalid[k]! + days.excluded[k]! > 0;
          if (!period.operatingDaysOnly || operated) {
            windowStart = days.start[k]!;
            need--;
          }
        }
      }
      break;
    }
    case 'rolling-hours': {
      periodStart = Math.floor(asOf / hourMs) * hourMs;
      periodEnd = periodStart + hourMs;
      windowStart = periodStart;
      let need = period.hours - 1;
      for (let i = firstIndexAtOrAfter(series.t, periodStart) - 1; i >= 0 && need > 0; i--) {
        if (!period.operatingHoursOnly || p.cls[i] !== HourClass.NotOperating) {
          windowStart = series.t[i]!;
          need--;
        }
      }
      break;
    }
  }

  let sum = 0;
  let n = 0;
  let invalid = 0;
  let above = 0;
  const aboveThreshold = limit * (1 + 1e-12);
  for (let i = firstIndexAtOrAfter(series.t, windowStart); i < series.t.length && series.t[i]! < asOf; i++) {
    const c = p.cls[i];
    if (c === HourClass.Usable) {
      sum += p.v[i]!;
      n++;
      if (p.v[i]! > aboveThreshold) above++;
    } else if (c === HourClass.Invalid) invalid++;
  }
  const remainingClock = Math.max(0, Math.ceil((periodEnd - Math.max(asOf, periodStart)) / hourMs));
  const remaining = opts.remainingValidHours ?? remainingClock;
  if (!(remaining >= 0 && Number.isFinite(remaining))) throw new CalcInputError('remainingValidHours must be a number ≥ 0.', 'remainingValidHours');
  const base = {
    rule,
    periodStart,
    periodEnd,
    windowStart,
    limit,
    validHoursSoFar: n,
    invalidHoursSoFar: invalid,
    averageSoFar: n ? sum / n : null,
    remainingHours: remaining,
  };

  if (rule.criterion.kind === 'share-of-periods') {
    const total = n + remaining;
    const allowed = Math.floor((1 - rule.criterion.share) * total + 1e-9);
    const left = allowed - above;
    return {
      ...base,
      maxAverageRemaining: null,
      maxValidatedAverageRemaining: null,
      exceedanceCertain: left < 0,
      periodsAboveAllowedRemaining: left,
      note: `${above} hour(s) above ${limit} so far; ${allowed} allowed if ${total} valid hours are reached`,
    };
  }

  let note: string | undefined;
  const maxInvalid = rule.minData?.maxInvalidHoursPerDay;
  if (period.kind === 'day' && maxInvalid !== undefined && invalid > maxInvalid) {
    note = `${invalid} invalid hours already: the day is invalid (more than ${maxInvalid})`;
  }
  if (remaining === 0) {
    const certain = n > 0 && sum / n > aboveThreshold;
    return { ...base, maxAverageRemaining: null, maxValidatedAverageRemaining: null, exceedanceCertain: certain, ...(note ? { note } : {}) };
  }
  const x = (limit * (n + remaining) - sum) / remaining;
  if (x < 0) {
    return {
      ...base,
      maxAverageRemaining: null,
      maxValidatedAverageRemaining: null,
      exceedanceCertain: true,
      note: note ?? 'even zero emissions in the remaining hours keep the average above the limit',
    };
  }
  return { ...base, maxAverageRemaining: x + ciAbs, maxValidatedAverageRemaining: x, exceedanceCertain: false, ...(note ? { note } : {}) };
}
