/**
 * Permit limits as data: pollutant, ELV and its unit, reference O2 and basis, averaging period,
 * compliance criterion, confidence interval, minimum data — validated with zod so that a rule
 * typed by an officer or stored in a table fails with a message that says what to fix.
 */
import { z } from 'zod';
import { CalcInputError } from '../errors';
import { IED_LCP_CONFIDENCE_INTERVAL_PERCENT, type IedLcpPollutant } from './confidence-interval';

/** Hour statuses a rule may leave out of its averages. */
export const EXCLUDABLE_STATUSES = ['startup-shutdown', 'substituted'] as const;

const positiveInt = (what: string) =>
  z.number({ error: `${what} must be a number` }).int({ error: `${what} must be a whole number` }).min(1, { error: `${what} must be at least 1` });

/** Averaging period of a limit. */
export const LimitPeriodSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('hour') }),
    z.object({ kind: z.literal('half-hour') }),
    z.object({ kind: z.literal('day') }),
    z.object({ kind: z.literal('month') }),
    z.object({ kind: z.literal('year') }),
    z.object({
      kind: z.literal('rolling-days'),
      days: positiveInt('The number of days of a rolling window'),
      /** Count only days on which the unit operated (e.g. "30 boiler operating days"); default true. */
      operatingDaysOnly: z.boolean().default(true),
    }),
    z.object({
      kind: z.literal('rolling-hours'),
      hours: positiveInt('The number of hours of a rolling window'),
      operatingHoursOnly: z.boolean().default(true),
    }),
    z.object({ kind: z.literal('block-hours'), hours: positiveInt('The number of hours of a block').max(24, { error: 'A block is at most 24 hours' }) }),
  ],
  { error: 'period.kind must be one of hour, half-hour, day, month, year, rolling-days, rolling-hours, block-hours' },
);
export type LimitPeriod = z.output<typeof LimitPeriodSchema>;

/**
 * Compliance criterion: every period ≤ factor × ELV (e.g. daily ≤ 110 %), or at least `share` of
 * the periods ≤ factor × ELV (e.g. 95 % of hours ≤ 200 %).
 */
export const LimitCriterionSchema = z.discriminatedUnion(
  'kind',
  [
    z.object({ kind: z.literal('every-period'), factor: z.number().positive({ error: 'criterion.factor must be above 0 (1 means 100 % of the ELV)' }).default(1) }),
    z.object({
      kind: z.literal('share-of-periods'),
      share: z.number().gt(0, { error: 'criterion.share must be above 0' }).max(1, { error: 'criterion.share is a share between 0 and 1 (0.95 for 95 %)' }),
      factor: z.number().positive({ error: 'criterion.factor must be above 0 (2 means 200 % of the ELV)' }),
    }),
  ],
  { error: 'criterion.kind must be every-period or share-of-periods' },
);
export type LimitCriterion = z.output<typeof LimitCriterionSchema>;

const count = (what: string) => z.number({ error: `${what} must be a number` }).min(0, { error: `${what} cannot be negative` }).optional();

export const MinDataSchema = z.object({
  maxInvalidHoursPerDay: count('minData.maxInvalidHoursPerDay'),
  minValidHours: count('minData.minValidHours'),
  minValidShare: z.number().min(0).max(1, { error: 'minData.minValidShare is a share between 0 and 1' }).optional(),
  minValidHoursPerDay: count('minData.minValidHoursPerDay'),
  minValidDays: count('minData.minValidDays'),
});

/** The zod schema of a limit rule. `LimitRuleInput` is what callers write; `LimitRule` has the defaults filled in. */
export const LimitRuleSchema = z
  .object({
    id: z.string().optional(),
    name: z.string().optional(),
    pollutant: z.string({ error: 'pollutant is required (e.g. "NOx")' }).min(1, { error: 'pollutant is required (e.g. "NOx")' }),
    elv: z.number({ error: 'elv (the emission limit value) must be a number' }).positive({ error: 'elv (the emission limit value) must be above 0' }),
    unit: z.string({ error: 'unit is required (e.g. "mg/Nm3")' }).min(1, { error: 'unit is required (e.g. "mg/Nm3")' }),
    /** Reference O2, % dry; null when the limit has none (e.g. lb/MMBtu limits). */
    referenceO2Percent: z.number({ error: 'referenceO2Percent must be a number or null' }).min(0, { error: 'referenceO2Percent cannot be negative' }).nullable(),
    /** 21 (EU, IED Annex VI Part 7) or 20.9 (US, 40 CFR 60). */
    ambientO2Percent: z.union([z.literal(21), z.literal(20.9)], { error: 'ambientO2Percent must be 21 (EU) or 20.9 (US)' }).default(21),
    basis: z.enum(['dry', 'wet'], { error: 'basis must be "dry" or "wet"' }).default('dry'),
    period: LimitPeriodSchema,
    criterion: LimitCriterionSchema,
    /** 95 % confidence interval as a percentage of the ELV (IED Annex V Part 3 point 9). */
    confidenceIntervalPercent: z
      .number()
      .min(0, { error: 'confidenceIntervalPercent cannot be negative' })
      .max(100, { error: 'confidenceIntervalPercent is a percentage of the ELV (0–100)' })
      .default(0),
    excludeStatuses: z.array(z.enum(EXCLUDABLE_STATUSES, { error: `excludeStatuses may hold ${EXCLUDABLE_STATUSES.join(', ')}` })).default(['startup-shutdown']),
    correctOnlyWhenAboveReference: z.boolean().default(false),
    /** A period above this percentage of the criterion's threshold (factor × ELV) but not above it is a near miss. */
    nearMissPercent: z.number().gt(0, { error: 'nearMissPercent must be above 0' }).lt(100, { error: 'nearMissPercent must be below 100' }).optional(),
    minData: MinDataSchema.optional(),
    /** Where the rule comes from (permit clause, regulation). */
    source: z.string().optional(),
  })
  .superRefine((r, ctx) => {
    if (r.referenceO2Percent !== null && r.referenceO2Percent >= r.ambientO2Percent) {
      ctx.addIssue({ code: 'custom', path: ['referenceO2Percent'], message: `referenceO2Percent must be below the ambient ${r.ambientO2Percent} %` });
    }
  });

export type LimitRule = z.output<typeof LimitRuleSchema>;
export type LimitRuleInput = z.input<typeof LimitRuleSchema>;

/** One problem found in a limit rule. */
export interface LimitRuleIssue {
  /** Dotted path of the field, e.g. `criterion.share`. */
  readonly path: string;
  readonly message: string;
}

export type LimitRuleCheck = { readonly ok: true; readonly rule: LimitRule } | { readonly ok: false; readonly issues: readonly LimitRuleIssue[] };

/**
 * Checks a limit rule and returns either the rule with defaults filled in or every issue found.
 *
 * @example
 * checkLimitRule({ pollutant: 'NOx', elv: -5 }).ok //=> false
 */
export function checkLimitRule(input: unknown): LimitRuleCheck {
  const r = LimitRuleSchema.safeParse(input);
  if (r.success) return { ok: true, rule: r.data };
  return {
    ok: false,
    issues: r.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(rule)', message: i.message })),
  };
}

/**
 * Parses a limit rule, throwing a CalcInputError that lists every issue (field = first path).
 */
export function parseLimitRule(input: unknown): LimitRule {
  const c = checkLimitRule(input);
  if (c.ok) return c.rule;
  throw new CalcInputError(`Invalid limit rule: ${c.issues.map((i) => `${i.path}: ${i.message}`).join('; ')}.`, c.issues[0]!.path);
}

// ---------------------------------------------------------------------------------------------
// Presets
// ---------------------------------------------------------------------------------------------

export { IED_LCP_CONFIDENCE_INTERVAL_PERCENT, type IedLcpPollutant } from './confidence-interval';

const IED_SOURCE = 'Directive 2010/75/EU (IED) Annex V Part 3 points 9–11 and Part 4 point 1';

export interface IedLcpPresetOptions {
  readonly pollutant: IedLcpPollutant;
  /** ELV in mg/Nm3, dry, at the reference O2. */
  readonly elvMgPerNm3: number;
  /** 6 % for solid fuels, 3 % for liquid and gaseous fuels other than gas turbines/engines, 15 % for gas turbines and engines (IED Annex V Part 1). */
  readonly referenceO2Percent: number;
  /** How the "monthly" average is formed: calendar month (default) or rolling 30 days — national practice. */
  readonly monthly?: 'calendar-month' | 'rolling-30-days';
  readonly nearMissPercent?: number;
}

/**
 * The IED large-combustion-plant compliance set for one pollutant (Annex V Part 4 point 1):
 * (a) no validated monthly average > ELV; (b) no validated daily average > 110 % ELV;
 * (d) 95 % of validated hourly averages over the calendar year ≤ 200 % ELV. Validated values
 * subtract the confidence interval of Part 3 point 9; a day with more than 3 invalid hours is
 * invalid (Part 3 point 11); start-up and shut-down are disregarded (Part 4 point 3).
 * Evaluate the 95 % rule over one calendar year.
 */
export function iedLcpRules(opts: IedLcpPresetOptions): [monthly: LimitRule, daily: LimitRule, hourly95: LimitRule] {
  const ci = IED_LCP_CONFIDENCE_INTERVAL_PERCENT[opts.pollutant];
  if (ci === undefined) throw new CalcInputError(`The IED Annex V set covers ${Object.keys(IED_LCP_CONFIDENCE_INTERVAL_PERCENT).join(', ')}; got "${opts.pollutant}".`, 'pollutant');
  const common = {
    pollutant: opts.pollutant,
    elv: opts.elvMgPerNm3,
    unit: 'mg/Nm3',
    referenceO2Percent: opts.referenceO2Percent,
    ambientO2Percent: 21 as const,
    basis: 'dry' as const,
    confidenceIntervalPercent: ci,
    excludeStatuses: ['startup-shutdown' as const],
    minData: { maxInvalidHoursPerDay: 3 },
    ...(opts.nearMissPercent !== undefined ? { nearMissPercent: opts.nearMissPercent } : {}),
  };
  const monthlyPeriod = opts.monthly === 'rolling-30-days' ? { kind: 'rolling-days' as const, days: 30, operatingDaysOnly: false } : { kind: 'month' as const };
  return [
    parseLimitRule({ ...common, id: `ied-${opts.pollutant}-monthly`, name: `${opts.pollutant} validated monthly average ≤ ELV`, period: monthlyPeriod, criterion: { kind: 'every-period', factor: 1 }, source: `${IED_SOURCE}(a)` }),
    parseLimitRule({ ...common, id: `ied-${opts.pollutant}-daily`, name: `${opts.pollutant} validated daily average ≤ 110 % ELV`, period: { kind: 'day' }, criterion: { kind: 'every-period', factor: 1.1 }, source: `${IED_SOURCE}(b)` }),
    parseLimitRule({ ...common, id: `ied-${opts.pollutant}-hourly-95`, name: `${opts.pollutant} 95 % of validated hourly averages ≤ 200 % ELV`, period: { kind: 'hour' }, criterion: { kind: 'share-of-periods', share: 0.95, factor: 2 }, source: `${IED_SOURCE}(d)` }),
  ];
}

export interface UsPresetOptions {
  readonly pollutant: string;
  readonly elv: number;
  /** e.g. "lb/MMBtu", "ng/J", "ppm @ 15 % O2". */
  readonly unit: string;
  /** Reference O2 for concentration limits (e.g. 15 for turbines in ppm @ 15 % O2), null for heat-input-based limits. */
  readonly referenceO2Percent?: number | null;
  readonly nearMissPercent?: number;
}

/**
 * US-style 30-boiler-operating-day rolling average ≤ ELV: compliance "based on the average
 * emission rate for 30 successive boiler operating days", a new rolling average computed at the
 * end of each boiler operating day (40 CFR 60.48Da(b) [pub: https://www.ecfr.gov/current/title-40/part-60/section-60.48Da]);
 * taken here as the mean of all valid hourly values of the current and preceding 29 operating
 * days (hourly-mean form [memory]). Minimum data 18 valid hours on at least 22 of the 30
 * days [memory] — recalled from the Subpart Da/Db monitoring sections, not from Method 19: Method
 * 19 §12.7 is "Determination of Compliance When Minimum Data Requirement Is Not Met" [pub: section
 * title, http://70.89.220.117/cleanairnet/Toolbox/Quality_Tools/EPA_Methods_Study_Guide/US_EPA_AirEmissionTestMethods_html/m-19.html].
 * Ambient O2 20.9 % (40 CFR 60).
 */
export function usRolling30DayRule(opts: UsPresetOptions): LimitRule {
  return parseLimitRule({
    id: `us-${opts.pollutant}-rolling-30-operating-days`,
    name: `${opts.pollutant} 30-operating-day rolling average ≤ ELV`,
    pollutant: opts.pollutant,
    elv: opts.elv,
    unit: opts.unit,
    referenceO2Percent: opts.referenceO2Percent ?? null,
    ambientO2Percent: 20.9,
    basis: 'dry',
    period: { kind: 'rolling-days', days: 30, operatingDaysOnly: true },
    criterion: { kind: 'every-period', factor: 1 },
    confidenceIntervalPercent: 0,
    minData: { minValidHoursPerDay: 18, minValidDays: 22 },
    ...(opts.nearMissPercent !== undefined ? { nearMissPercent: opts.nearMissPercent } : {}),
    source: '40 CFR 60.48Da(b) (30-boiler-operating-day rolling average) [pub]; minimum data 18 h on 22 of 30 days [memory]',
  });
}

/**
 * US-style 3-hour block average ≤ ELV: consecutive 3-hour blocks from local midnight
 * (several 40 CFR 60 subparts [memory]); at least 2 valid hours per block (common practice).
 */
export function usThreeHourBlockRule(opts: UsPresetOptions): LimitRule {
  return parseLimitRule({
    id: `us-${opts.pollutant}-3-hour-block`,
    name: `${opts.pollutant} 3-hour block average ≤ ELV`,
    pollutant: opts.pollutant,
    elv: opts.elv,
    unit: opts.unit,
    referenceO2Percent: opts.referenceO2Percent ?? null,
    ambientO2Percent: 20.9,
    basis: 'dry',
    period: { kind: 'block-hours', hours: 3 },
    criterion: { kind: 'every-period', factor: 1 },
    minData: { minValidHours: 2 },
    ...(opts.nearMissPercent !== undefined ? { nearMissPercent: opts.nearMissPercent } : {}),
    source: '40 CFR 60 3-hour block averages [memory]; 2 of 3 valid hours: common practice',
  });
}
