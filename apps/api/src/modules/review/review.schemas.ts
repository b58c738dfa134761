import { z } from 'zod';
import { LimitDto } from '../permits/limits.schemas';

const Id = z.uuid();
/** A calendar date (the site's local midnight) or an instant with its offset. */
const Instant = z.union([z.iso.date(), z.iso.datetime({ offset: true })], { error: 'Use a date (YYYY-MM-DD) or an ISO-8601 date-time with offset' });

export const StackParams = z.object({ stackId: Id });
export const ChannelParams = z.object({ channelId: Id });

const Flag = z
  .union([z.boolean(), z.enum(['true', 'false', '1', '0'])])
  .optional()
  .transform((v) => v === true || v === 'true' || v === '1');

/**
 * Without from/to the review shows the site's local calendar month holding the latest data.
 * `derivation=true` adds each limit hour's O2 and mass rate (left out by default: they double the
 * size of the hourly series, and the screens do not show them).
 */
export const ReviewQuery = z.object({ from: Instant.optional(), to: Instant.optional(), derivation: Flag });
export type ReviewQuery = z.infer<typeof ReviewQuery>;

/** Without from/to the drill-down shows the channel's last day of readings. */
export const ReadingsQuery = z.object({
  from: Instant.optional(),
  to: Instant.optional(),
  includeSuperseded: Flag,
});
export type ReadingsQuery = z.infer<typeof ReadingsQuery>;

export const CORRECTION_ACTIONS = ['invalidate', 'substitute'] as const;

export const CorrectionBody = z
  .object({
    from: z.iso.datetime({ offset: true }),
    to: z.iso.datetime({ offset: true }),
    action: z.enum(CORRECTION_ACTIONS),
    /** The value every substituted reading gets, in the channel's unit (substitute only). */
    valuePerReading: z.number().finite().nullish(),
    reason: z.string().trim().min(3, 'Say why, in a few words').max(2000),
  })
  .refine((b) => Date.parse(b.from) < Date.parse(b.to), { message: '"to" must be after "from"', path: ['to'] })
  .refine((b) => b.action !== 'substitute' || typeof b.valuePerReading === 'number', {
    message: 'A substitution needs valuePerReading',
    path: ['valuePerReading'],
  });
export type CorrectionBody = z.infer<typeof CorrectionBody>;

const Num = z.number().nullable();

/**
 * Hourly and daily series travel as columns: per channel and per limit one array per field, all
 * of the same length, index i describing the i-th hour (or day). A month of eight channels and six
 * limits is then a few dozen flat arrays instead of thousands of small objects to build, send and
 * decode. Statuses and reasons are small integers, indexes into the legend sent beside them.
 * A null status means no stored value for that hour (the other fields are null too).
 */
// The same check as z.array(z.number().nullable()), as one loop: a month is some 40,000 entries,
// and zod's per-element parse would cost more than building the whole answer.
const isNumberOrNull = (x: unknown) => x === null || (typeof x === 'number' && Number.isFinite(x));
const isCodeOrNull = (x: unknown) => x === null || Number.isInteger(x);
const Column = z.custom<(number | null)[]>((v) => Array.isArray(v) && v.every(isNumberOrNull), { error: 'Expected an array of numbers or nulls' });
const CodeColumn = z.custom<(number | null)[]>((v) => Array.isArray(v) && v.every(isCodeOrNull), { error: 'Expected an array of integers or nulls' });

/**
 * A column sent as its exceptions: entry i is `values[k]` where `at[k] === i`, and `usual`
 * everywhere else (`at` ascending). Statuses, reasons and coverages are the same for almost every
 * hour (valid, no reason, fully covered); sent in full they were a third of a month's answer.
 */
const SparseColumn = z
  .object({
    usual: z.number().nullable(),
    at: z.custom<number[]>((v) => Array.isArray(v) && v.every((x) => Number.isInteger(x) && x >= 0), { error: 'Expected an array of indexes' }),
    values: Column,
  })
  .refine((c) => c.at.length === c.values.length, { error: '"at" and "values" must be as long as each other' });

const HourlyChannelColumns = z.object({
  /**
   * Mean of the hour's valid readings, in the channel's unit and basis, to 10 significant digits
   * (wire-precision.ts; the stored value and the verdicts keep full precision).
   */
  value: Column,
  /** Index in `hourly.statusLegend`; null where no hour is stored (usually `valid`, code 0). */
  status: SparseColumn,
  /** Share (0–1) of the hour covered by valid readings, rounded to 0.001 (usually 1). */
  coverage: SparseColumn,
  /** Index in `hourly.reasonLegend` of why the hour is not valid; 0 (`none`) when there is no reason. */
  reason: SparseColumn,
});
const HourlyLimitColumns = z.object({
  /** In the limit's unit, basis and reference O2; rounded as the channels' values. */
  value: Column,
  status: SparseColumn,
  reason: SparseColumn,
  /** With `derivation=true` only: the O2 the hour was corrected with, and its mass rate. */
  o2PercentDry: Column.optional(),
  massKgPerHour: Column.optional(),
});
const DailyChannelColumns = z.object({ value: Column, status: CodeColumn, coverage: Column, validHours: CodeColumn, invalidHours: CodeColumn });
const DailyLimitColumns = z.object({
  /** The measured daily average. */
  value: Column,
  /** After the confidence interval is subtracted, where the limit asks for it. */
  validatedValue: Column,
  status: CodeColumn,
  validHours: CodeColumn,
  invalidHours: CodeColumn,
});

/**
 * The hours of the period on a regular UTC grid: hour i starts at `fromMs + i · stepMs` (UTC epoch
 * ms) for i < count. Channels (limits) with no stored hour in the period are left out.
 */
export const HourlySeriesDto = z.object({
  fromMs: z.number(),
  stepMs: z.number(),
  count: z.number().int(),
  statusLegend: z.array(z.string()),
  reasonLegend: z.array(z.string()),
  channels: z.record(z.string(), HourlyChannelColumns),
  limits: z.record(z.string(), HourlyLimitColumns),
});

/** The site's local calendar days (23, 24 or 25 hours long), each bounded by its two local midnights. */
export const DailySeriesDto = z.object({
  dayStart: z.array(z.string()),
  dayEnd: z.array(z.string()),
  statusLegend: z.array(z.string()),
  channels: z.record(z.string(), DailyChannelColumns),
  limits: z.record(z.string(), DailyLimitColumns),
});

const EventDto = z.object({
  start: z.string(),
  end: z.string(),
  peak: z.number(),
  peakAt: z.string(),
  percentOfElv: z.number(),
  threshold: z.number(),
  periodCount: z.number(),
});

export const ReviewDto = z.object({
  stack: z.object({ id: z.string(), name: z.string(), siteId: z.string(), siteName: z.string() }),
  from: z.string(),
  to: z.string(),
  timeZone: z.string(),
  channels: z.array(
    z.object({ id: z.string(), parameter: z.string(), unit: z.string(), basis: z.string(), conditions: z.string(), intervalMinutes: z.number() }),
  ),
  hourly: HourlySeriesDto,
  daily: DailySeriesDto,
  limits: z.array(
    z.object({
      limit: LimitDto,
      channelId: z.string().nullable(),
      verdict: z.enum(['compliant', 'exceedance', 'insufficient_data']),
      note: z.string(),
      threshold: z.number(),
      availabilityPercent: Num,
      validHours: z.number(),
      invalidHours: z.number(),
      invalidDays: z.number(),
      exceedances: z.array(EventDto),
      nearMisses: z.array(EventDto),
      share: z.object({ required: z.number(), achieved: Num, validPeriods: z.number(), periodsAbove: z.number(), allowedAbove: z.number() }).nullable(),
      headroom: z
        .object({
          asOf: z.string(),
          periodStart: z.string(),
          periodEnd: z.string(),
          remainingHours: z.number(),
          averageSoFar: Num,
          maxAverageToStayCompliant: Num,
          exceedanceCertain: z.boolean(),
          periodsAboveAllowedRemaining: Num,
          note: z.string().nullable(),
        })
        .nullable(),
    }),
  ),
  plausibility: z.array(
    z.object({ hourStart: z.string(), o2PercentDry: z.number(), expectedCo2PercentDry: z.number(), measuredCo2PercentDry: z.number(), deviationPercent: z.number() }),
  ),
  plausibilityCheck: z.object({
    co2MaxPercentDry: Num,
    tolerancePercent: z.number(),
    hoursChecked: z.number(),
    note: z.string().nullable(),
  }),
  computedAt: z.string().nullable(),
  disclaimer: z.string(),
});
export type ReviewDto = z.input<typeof ReviewDto>;

export const ReadingDto = z.object({
  id: z.string(),
  t: z.string(),
  value: Num,
  status: z.string(),
  current: z.boolean(),
  importId: z.string().nullable(),
  /** Who wrote the reading: a person's correction, or the committer of the import that brought it. */
  createdBy: z.string().nullable(),
  createdByName: z.string().nullable(),
  createdAt: z.string(),
  supersededAt: z.string().nullable(),
  supersededBy: z.string().nullable(),
  reason: z.string().nullable(),
});

export const ReadingsDto = z.object({
  channel: z.object({ id: z.string(), stackId: z.string(), parameter: z.string(), unit: z.string(), basis: z.string(), intervalMinutes: z.number() }),
  from: z.string(),
  to: z.string(),
  includeSuperseded: z.boolean(),
  items: z.array(ReadingDto),
  truncated: z.boolean(),
  imports: z.array(
    z.object({
      id: z.string(),
      fileName: z.string(),
      sha256: z.string(),
      state: z.string(),
      uploadedAt: z.string(),
      uploadedBy: z.string(),
      committedAt: z.string().nullable(),
      rolledBackAt: z.string().nullable(),
    }),
  ),
  hours: z.array(
    z.object({
      hourStart: z.string(),
      value: Num,
      status: z.string(),
      coverage: z.number(),
      reason: z.string().nullable(),
      readingsValid: z.number(),
      readingsTotal: z.number(),
    }),
  ),
});
export type ReadingsDto = z.input<typeof ReadingsDto>;

export const CorrectionResultDto = z.object({
  channelId: z.string(),
  action: z.enum(CORRECTION_ACTIONS),
  from: z.string(),
  to: z.string(),
  reason: z.string(),
  valuePerReading: Num,
  superseded: z.number(),
  inserted: z.number(),
  hoursRecomputed: z.number(),
});
export type CorrectionResultDto = z.input<typeof CorrectionResultDto>;
