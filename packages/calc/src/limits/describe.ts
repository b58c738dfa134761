/**
 * A permit limit as one plain sentence for people. Pure and free of zod, so the browser can show
 * the sentence while an officer types with the same code the API uses to store `Limit.summary`.
 *
 * The words are FlueLedger's own; the notions are the permit's: the emission limit value (ELV),
 * its basis and reference O2, the averaging period, the validated value (measured minus the
 * confidence interval, IED 2010/75/EU Annex V Part 3 point 9–10 [pub]) and the compliance
 * criterion (IED Annex V Part 4 point 1 [pub]: every period, or a share of periods, at or below a
 * multiple of the ELV).
 */

/** Averaging periods as limits are stored (the API's `Period`). */
export type LimitSentencePeriod =
  | 'hour'
  | 'half_hour'
  | 'day'
  | 'month'
  | 'year'
  | 'rolling_days'
  | 'rolling_hours'
  | 'block_hours';

/** The compliance criterion as limits are stored: `factor` × ELV, `share` of periods (0–1). */
export type LimitSentenceCriterion =
  | { readonly type: 'every_period'; readonly factor: number }
  | { readonly type: 'share_of_periods'; readonly factor: number; readonly share: number };

/** What the sentence of a limit is made of (the fields of a stored limit). */
export interface LimitSentenceInput {
  /** As it should read, e.g. "NOx". */
  readonly pollutant: string;
  /** The emission limit value, in `unit`. */
  readonly elv: number;
  /** e.g. "mg/Nm3", "ppm", "lb/MMBtu". */
  readonly unit: string;
  /** Reference O2, % dry; null when the limit is not corrected to one. */
  readonly referenceO2Percent: number | null;
  readonly basis: 'dry' | 'wet';
  readonly period: LimitSentencePeriod;
  /** Days or hours of a rolling window or block; null for calendar periods. */
  readonly periodLength: number | null;
  /** Rolling windows count only periods the unit operated in. */
  readonly operatingPeriodsOnly: boolean;
  readonly criterion: LimitSentenceCriterion;
  /** 95 % confidence interval, % of the ELV, subtracted to validate a value; null or 0 for none. */
  readonly confidenceIntervalPercent: number | null;
  /** Correct to the reference O2 only when the measured O2 is above it. */
  readonly correctOnlyWhenAbove: boolean;
}

/**
 * Units of limits on heat input or on mass, to which no reference O2 applies: lb/MMBtu and ng/J
 * are formed with F-factors (EPA Method 19 [pub]); kg/h and t/yr are mass rates and totals.
 */
export const LIMIT_UNITS_WITHOUT_REFERENCE_O2 = ['lb/MMBtu', 'ng/J', 'kg/h', 't/yr'] as const;

const HEAT_INPUT_UNITS: readonly string[] = ['lb/MMBtu', 'ng/J'];
const MINUS = '\u2212';

/** Numbers as people write them: six significant digits at most, no trailing zeros. */
const num = (n: number): string => String(Number(n.toPrecision(6)));

function averageName(limit: LimitSentenceInput): string {
  const n = limit.periodLength ?? 0;
  const operating = limit.operatingPeriodsOnly ? ' operating' : '';
  switch (limit.period) {
    case 'hour':
      return 'hourly average';
    case 'half_hour':
      return 'half-hourly average';
    case 'day':
      return 'daily average';
    case 'month':
      return 'monthly average';
    case 'year':
      return 'annual average';
    case 'rolling_days':
      return `${n}${operating}-day rolling average`;
    case 'rolling_hours':
      return `${n}${operating}-hour rolling average`;
    case 'block_hours':
      return `${n}-hour block average`;
  }
}

function periodsName(limit: LimitSentenceInput, plural: boolean): string {
  const n = limit.periodLength ?? 0;
  const s = plural ? 's' : '';
  switch (limit.period) {
    case 'hour':
      return `hour${s}`;
    case 'half_hour':
      return `half-hour${s}`;
    case 'day':
      return `day${s}`;
    case 'month':
      return `month${s}`;
    case 'year':
      return `year${s}`;
    case 'rolling_days':
      return `${n}-day average${s}`;
    case 'rolling_hours':
      return `${n}-hour average${s}`;
    case 'block_hours':
      return `${n}-hour block${s}`;
  }
}

const ofElv = (factor: number): string => (factor === 1 ? 'ELV' : `${num(factor * 100)} % of ELV`);

/**
 * The limit in one sentence: pollutant and ELV with its unit; basis and reference O2 (or that
 * the limit is per heat input); the averaging period; the confidence interval subtracted to
 * validate; and the compliance criterion.
 *
 * @example
 * describeLimit({
 *   pollutant: 'NOx', elv: 100, unit: 'mg/Nm3', referenceO2Percent: 3, basis: 'dry',
 *   period: 'day', periodLength: null, operatingPeriodsOnly: true,
 *   criterion: { type: 'every_period', factor: 1.1 }, confidenceIntervalPercent: 20,
 *   correctOnlyWhenAbove: false,
 * })
 * //=> "NOx ≤ 100 mg/Nm3, dry, 3 % O2, daily average, validated (−20 %), every day ≤ 110 % of ELV"
 */
export function describeLimit(limit: LimitSentenceInput): string {
  // The sentence starts with the pollutant: 'dust' reads as 'Dust'; formulae (NOx, SO2) are unchanged.
  const pollutant = limit.pollutant.charAt(0).toUpperCase() + limit.pollutant.slice(1);
  const parts = [`${pollutant} ≤ ${num(limit.elv)} ${limit.unit}`];
  if ((LIMIT_UNITS_WITHOUT_REFERENCE_O2 as readonly string[]).includes(limit.unit)) {
    if (HEAT_INPUT_UNITS.includes(limit.unit)) parts.push('per heat input (F-factor)');
  } else {
    parts.push(limit.basis);
    if (limit.referenceO2Percent === null) parts.push('no O2 correction');
    else parts.push(`${num(limit.referenceO2Percent)} % O2${limit.correctOnlyWhenAbove ? ' (corrected only when above)' : ''}`);
  }
  parts.push(averageName(limit));
  if (limit.confidenceIntervalPercent) parts.push(`validated (${MINUS}${num(limit.confidenceIntervalPercent)} %)`);
  const { criterion } = limit;
  if (criterion.type === 'every_period') {
    parts.push(`every ${periodsName(limit, false)} ≤ ${ofElv(criterion.factor)}`);
  } else {
    parts.push(`${num(criterion.share * 100)} % of ${periodsName(limit, true)} ≤ ${ofElv(criterion.factor)}`);
  }
  return parts.join(', ');
}
