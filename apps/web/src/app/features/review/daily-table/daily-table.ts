import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';
import { MatTableModule } from '@angular/material/table';

import type { Column, Review } from '../../../core/api/review-api';
import { formatInUnit, formatNumber } from '../../../shared/format-number';
import { unitLabel } from '../../../shared/setup-labels';

const hourMs = 3_600_000;

/**
 * Same tolerance as the calculation's comparison with factor × ELV, so a day equal to the
 * threshold up to rounding (1.1 × 100 = 110.00000000000001) is not marked above it.
 */
const equalTolerance = 1e-12;

/** Daily statuses in words; "Not valid" as the hourly table says it, so one page reads alike. */
const dayStatusLabels: Record<string, string> = {
  valid: 'Valid',
  invalid: 'Not valid',
  not_operating: 'Not operating',
  incomplete: 'Incomplete',
};

export function dayStatusLabel(status: string | null): string {
  if (!status) return '—';
  return dayStatusLabels[status] ?? status.replace(/_/g, ' ');
}

const dayFormatters = new Map<string, Intl.DateTimeFormat>();

/**
 * A local calendar day as the site reads it, from the instant its local midnight falls on.
 * @example dayLabel('2026-11-01T23:00:00.000Z', 'Europe/Berlin') //=> "Mon 2 Nov 2026"
 */
export function dayLabel(dayStart: string, timeZone: string): string {
  let formatter = dayFormatters.get(timeZone);
  if (!formatter) {
    formatter = new Intl.DateTimeFormat('en-GB', { timeZone, weekday: 'short', day: 'numeric', month: 'short', year: 'numeric' });
    dayFormatters.set(timeZone, formatter);
  }
  // From the parts, not format(): en-GB puts a comma after the weekday.
  const parts = Object.fromEntries(formatter.formatToParts(Date.parse(dayStart)).map((part) => [part.type, part.value]));
  return `${parts['weekday']} ${parts['day']} ${parts['month']} ${parts['year']}`;
}

/** One local day of the limit, decoded from the daily columns. */
export interface DayRow {
  dayStart: string;
  label: string;
  /** Clock hours of the local day: 23 or 25 on the days summer time starts or ends. */
  hoursInDay: number;
  measured: number | null;
  validated: number | null;
  /** The value compared with the threshold: the validated average where there is one, else the measured one. */
  judged: number | null;
  /** `valid`, `invalid`, `not_operating`, `incomplete`; null when the limit has nothing stored that day. */
  status: string | null;
  validHours: number | null;
  invalidHours: number | null;
  above: boolean;
}

const at = (column: Column | undefined, i: number): number | null => column?.[i] ?? null;

let nextId = 0;

/**
 * The daily averages of one limit over the review's local days: measured, validated (where the
 * limit subtracts a confidence interval), status, valid and invalid hours, and whether the value
 * judged lies above the limit's threshold.
 */
@Component({
  selector: 'fl-daily-table',
  imports: [MatIconModule, MatTableModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './daily-table.html',
  styleUrl: './daily-table.scss',
})
export class DailyTable {
  readonly review = input.required<Review>();
  readonly limitId = input.required<string>();

  protected readonly noteId = `fl-daily-note-${nextId++}`;
  protected readonly formatInUnit = formatInUnit;
  protected readonly formatNumber = formatNumber;
  protected readonly unitLabel = unitLabel;
  protected readonly dayStatusLabel = dayStatusLabel;

  protected readonly entry = computed(() => this.review().limits.find((l) => l.limit.id === this.limitId()) ?? null);
  protected readonly limit = computed(() => this.entry()?.limit ?? null);
  /** The confidence interval in percent of the ELV; 0 when the limit has none. */
  protected readonly confidenceIntervalPercent = computed(() => this.limit()?.confidenceIntervalPercent ?? 0);
  protected readonly hasValidated = computed(() => this.confidenceIntervalPercent() > 0);
  protected readonly threshold = computed(() => this.entry()?.threshold ?? null);
  /** The threshold as a percentage of the ELV (110 for a daily IED limit judged at 110 %). */
  protected readonly thresholdPercentOfElv = computed(() => {
    const limit = this.limit();
    const threshold = this.threshold();
    return limit && threshold !== null && limit.elv > 0 ? Number(((threshold / limit.elv) * 100).toPrecision(12)) : 100;
  });
  protected readonly aboveLabel = computed(() =>
    this.thresholdPercentOfElv() === 100 ? 'Above the ELV' : `Above ${formatNumber(this.thresholdPercentOfElv(), 1)} % of the ELV`,
  );

  protected readonly rows = computed<DayRow[]>(() => {
    const review = this.review();
    const daily = review.daily;
    const columns = daily.limits[this.limitId()];
    const threshold = this.threshold();
    if (!columns) return [];
    const rows = daily.dayStart.map((dayStart, i): DayRow => {
      const code = at(columns.status, i);
      const measured = at(columns.value, i);
      const validated = this.hasValidated() ? at(columns.validatedValue, i) : null;
      const judged = validated ?? measured;
      return {
        dayStart,
        label: dayLabel(dayStart, review.timeZone),
        hoursInDay: Math.round((Date.parse(daily.dayEnd[i] ?? dayStart) - Date.parse(dayStart)) / hourMs),
        measured,
        validated,
        judged,
        status: code === null ? null : (daily.statusLegend[code] ?? null),
        validHours: at(columns.validHours, i),
        invalidHours: at(columns.invalidHours, i),
        above: judged !== null && threshold !== null && judged > threshold * (1 + equalTolerance),
      };
    });
    // A limit with nothing stored on any day shows the empty state, not a column of dashes.
    return rows.some((row) => row.status !== null || row.measured !== null) ? rows : [];
  });

  protected readonly columns = computed(() => [
    'day',
    'measured',
    ...(this.hasValidated() ? ['validated'] : []),
    'status',
    'validHours',
    'invalidHours',
    'check',
  ]);

  /** The unit and reference conditions the values are in, for the column headers. */
  protected readonly unitText = computed(() => {
    const limit = this.limit();
    if (!limit) return '';
    return `${unitLabel(limit.unit)}${limit.referenceO2Percent !== null ? `, ${formatNumber(limit.referenceO2Percent)} % O2` : ''}`;
  });

  /** The confidence interval in the limit's unit (20 % of an ELV of 100 mg/Nm3 is 20 mg/Nm3). */
  protected readonly confidenceIntervalInUnit = computed(() => {
    const limit = this.limit();
    return limit ? (this.confidenceIntervalPercent() / 100) * limit.elv : 0;
  });

  /** "A day is marked when it is above 110 mg/Nm3 (110 % of the ELV of 100 mg/Nm3)." */
  protected readonly thresholdSentence = computed(() => {
    const limit = this.limit();
    const threshold = this.threshold();
    if (!limit || threshold === null) return '';
    const unit = unitLabel(limit.unit);
    const share = this.thresholdPercentOfElv() === 100 ? ', the ELV' : ` (${formatNumber(this.thresholdPercentOfElv(), 1)} % of the ELV of ${formatNumber(limit.elv)} ${unit})`;
    return `A day is marked when it is above ${formatNumber(threshold)} ${unit}${share}.`;
  });

  /** Only days of a daily limit are judged one by one; for other periods the marks are for orientation. */
  protected readonly judgedPerDay = computed(() => this.limit()?.period === 'day');
}
