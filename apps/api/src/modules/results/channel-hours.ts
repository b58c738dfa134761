/**
 * A channel's raw readings → its hourly values, with the compliance engine's `aggregateHours`
 * (mean of the valid readings, validity rule, coverage). This file only translates between the
 * database's words (snake_case statuses) and the engine's, and picks the validity rule.
 */
import {
  HOUR_REASONS,
  HOUR_STATUSES,
  type HourReason,
  type HourStatus,
  type HourlySeries,
  type ReadingColumns,
  ReadingStatusCode,
  type ValidityRule,
  aggregateHours,
  hourlySeriesFromValues,
} from '@flueledger/calc';

/** Reading statuses as stored (migration 20261203000200). */
export const DB_READING_STATUSES = [
  'valid',
  'calibration',
  'maintenance',
  'fault',
  'out_of_range',
  'not_operating',
  'startup_shutdown',
  'substituted',
  'invalidated',
] as const;
export type DbReadingStatus = (typeof DB_READING_STATUSES)[number];

/**
 * Stored reading status → the engine's status code. A reading the officer invalidated counts as
 * a non-valid reading of the hour (like an analyser fault): the hour sees that a reading was
 * there, but never its value.
 */
export const READING_STATUS_CODE: Readonly<Record<DbReadingStatus, number>> = {
  valid: ReadingStatusCode.valid,
  calibration: ReadingStatusCode.calibration,
  maintenance: ReadingStatusCode.maintenance,
  fault: ReadingStatusCode.fault,
  out_of_range: ReadingStatusCode['out-of-range'],
  not_operating: ReadingStatusCode['not-operating'],
  startup_shutdown: ReadingStatusCode['startup-shutdown'],
  substituted: ReadingStatusCode.substituted,
  invalidated: ReadingStatusCode.fault,
};

/** Hour statuses as stored: the engine's words in snake_case (valid, invalid, not_operating …). */
export type DbHourStatus = 'valid' | 'substituted' | 'invalid' | 'not_operating' | 'startup_shutdown';

export const toDbWord = (word: string): string => word.replace(/-/g, '_');
const fromDbWord = (word: string): string => word.replace(/_/g, '-');

export function toDbHourStatus(status: HourStatus): DbHourStatus {
  return toDbWord(status) as DbHourStatus;
}

/**
 * The hour validity rule of a site's regime. US sites: one valid reading in each 15-minute
 * quadrant the unit operated (40 CFR 60.13(h)(2), 75.10(d)(1) [memory on the exact wording]);
 * EU and other sites: valid readings covering at least two thirds of the hour (common practice in
 * EU national guidance, [memory]; the IED does not fix it).
 */
export function validityRuleFor(regime: 'eu_ied' | 'us_epa' | 'other'): ValidityRule {
  return regime === 'us_epa' ? { kind: 'quadrants' } : { kind: 'min-share', share: 2 / 3 };
}

/** One stored row of `hourly_values`. */
export interface ChannelHourRow {
  /** UTC epoch ms. */
  hourStart: number;
  value: number | null;
  status: DbHourStatus;
  coverage: number;
  readingsValid: number;
  readingsTotal: number;
  reason: string | null;
}

/**
 * Hourly values of one channel over [fromMs, toMs) (whole hours). Readings stand for the
 * interval that starts at their timestamp (the readings store's convention).
 */
export function channelHours(
  readings: ReadingColumns,
  opts: { fromMs: number; toMs: number; intervalMinutes: number; rule: ValidityRule },
): ChannelHourRow[] {
  const s = aggregateHours(readings, {
    from: opts.fromMs,
    to: opts.toMs,
    intervalMinutes: opts.intervalMinutes,
    rule: opts.rule,
    timestampMarks: 'start',
  });
  const rows: ChannelHourRow[] = new Array(s.t.length);
  for (let i = 0; i < s.t.length; i++) {
    const v = s.value[i]!;
    const c = s.coverage[i]!;
    const reason = s.reason[i]!;
    rows[i] = {
      hourStart: s.t[i]!,
      value: Number.isNaN(v) ? null : v,
      status: toDbHourStatus(HOUR_STATUSES[s.status[i]!]!),
      coverage: Number.isNaN(c) ? 0 : c,
      readingsValid: s.validCount[i]!,
      readingsTotal: s.readingCount[i]!,
      reason: reason ? toDbWord(HOUR_REASONS[reason]!) : null,
    };
  }
  return rows;
}

/** Stored hourly rows (any order) → the engine's column series. */
export function seriesFromStoredHours(
  rows: readonly { hourStart: number; value: number | null; status: string; coverage?: number | null; reason?: string | null }[],
): HourlySeries {
  return hourlySeriesFromValues(
    rows.map((r) => {
      const status = fromDbWord(r.status) as HourStatus;
      const usable = status === 'valid' || status === 'substituted';
      return {
        t: r.hourStart,
        // A usable hour always has a number; keep a stray null from breaking a whole review.
        value: r.value,
        status: usable && r.value === null ? 'invalid' : status,
        coverage: r.coverage ?? null,
        reason: r.reason && (HOUR_REASONS as readonly string[]).includes(fromDbWord(r.reason)) ? (fromDbWord(r.reason) as HourReason) : null,
      };
    }),
  );
}
