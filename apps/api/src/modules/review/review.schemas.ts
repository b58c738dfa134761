import { z } from 'zod';
import { LimitDto } from '../permits/limits.schemas';

const Id = z.uuid();
/** A calendar date (the site's local midnight) or an instant with its offset. */
const Instant = z.union([z.iso.date(), z.iso.datetime({ offset: true })], { error: 'Use a date (YYYY-MM-DD) or an ISO-8601 date-time with offset' });

export const StackParams = z.object({ stackId: Id });
export const ChannelParams = z.object({ channelId: Id });

/** Without from/to the review shows the site's local calendar month holding the latest data. */
export const ReviewQuery = z.object({ from: Instant.optional(), to: Instant.optional() });
export type ReviewQuery = z.infer<typeof ReviewQuery>;

/** Without from/to the drill-down shows the channel's last day of readings. */
export const ReadingsQuery = z.object({
  from: Instant.optional(),
  to: Instant.optional(),
  includeSuperseded: z
    .union([z.boolean(), z.enum(['true', 'false', '1', '0'])])
    .optional()
    .transform((v) => v === true || v === 'true' || v === '1'),
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

const ChannelHourDto = z.object({ value: Num, status: z.string(), coverage: Num, reason: z.string().nullable() });
const LimitHourDto = z.object({ value: Num, status: z.string(), reason: z.string().nullable(), o2PercentDry: Num, massKgPerHour: Num });
const ChannelDayDto = z.object({ value: Num, status: z.string(), coverage: Num, validHours: z.number(), invalidHours: z.number() });
const LimitDayDto = z.object({ value: Num, validatedValue: Num, status: z.string(), validHours: z.number(), invalidHours: z.number() });

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
  hourly: z.array(z.object({ hourStart: z.string(), channels: z.record(z.string(), ChannelHourDto), limits: z.record(z.string(), LimitHourDto) })),
  daily: z.array(
    z.object({ dayStart: z.string(), dayEnd: z.string(), channels: z.record(z.string(), ChannelDayDto), limits: z.record(z.string(), LimitDayDto) }),
  ),
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
  createdBy: z.string().nullable(),
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
