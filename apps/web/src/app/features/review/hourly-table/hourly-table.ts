import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatPaginatorModule } from '@angular/material/paginator';
import { MatTableModule } from '@angular/material/table';

import type { Limit } from '../../../core/api/permits-api';
import type { Review } from '../../../core/api/review-api';
import { ClientTable } from '../../../shared/client-table';
import { formatInUnit, formatNumber } from '../../../shared/format-number';
import { unitLabel } from '../../../shared/setup-labels';
import { formatZoned } from '../../../shared/time/zoned-time';
import { HourRow, hourRows } from '../review-series';

const statusLabels: Record<string, string> = {
  valid: 'Valid',
  invalid: 'Not valid',
  not_operating: 'Not operating',
  insufficient_data: 'Too few readings',
  substituted: 'Substituted',
  invalidated: 'Marked invalid',
  calibration: 'Calibration',
  maintenance: 'Maintenance',
  fault: 'Analyser fault',
  out_of_range: 'Out of range',
  startup_shutdown: 'Start-up or shut-down',
};

type LimitColumns = Review['hourly']['limits'];

function sameColumn(a: readonly unknown[] | undefined, b: readonly unknown[] | undefined): boolean {
  return a !== undefined && b !== undefined && a.length === b.length && a.every((value, i) => value === b[i]);
}

/** Whether two limits' corrected hours are the same figures in the same unit, at the same reference O2. */
function sameHourlyValues(a: Limit, b: Limit, hourly: LimitColumns): boolean {
  if (a.unit !== b.unit || a.referenceO2Percent !== b.referenceO2Percent || a.basis !== b.basis || a.elv !== b.elv) return false;
  const left = hourly[a.id];
  const right = hourly[b.id];
  return sameColumn(left?.value, right?.value) && sameColumn(left?.status, right?.status);
}

export function statusLabel(status: string | null | undefined): string {
  if (!status) return '—';
  return statusLabels[status] ?? status.replace(/_/g, ' ');
}

/** The hourly values of one channel with their status and coverage, and the corrected values of its limits. */
@Component({
  selector: 'fl-hourly-table',
  imports: [MatButtonModule, MatPaginatorModule, MatTableModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './hourly-table.html',
  styleUrl: './hourly-table.scss',
})
export class HourlyTable {
  readonly review = input.required<Review>();
  readonly channelId = input.required<string>();
  readonly drill = output<string>();

  protected readonly formatZoned = formatZoned;
  protected readonly formatNumber = formatNumber;
  protected readonly formatInUnit = formatInUnit;
  protected readonly statusLabel = statusLabel;

  protected readonly channel = computed(() => this.review().channels.find((c) => c.id === this.channelId()) ?? null);
  /**
   * The limits judged on this channel: their corrected hourly values sit beside the measured one.
   * Limits that differ only in their averaging period (a monthly, a daily and an hourly NOx limit at
   * the same reference O2) have the same corrected hours: those get one column, not three alike.
   */
  protected readonly limits = computed(() => {
    const hourly = this.review().hourly.limits;
    const shown: Limit[] = [];
    for (const { limit } of this.review().limits.filter((entry) => entry.channelId === this.channelId())) {
      const twin = shown.find((other) => sameHourlyValues(other, limit, hourly));
      if (!twin) shown.push(limit);
    }
    return shown;
  });
  protected readonly columns = computed(() => ['hour', 'value', 'status', 'coverage', ...this.limits().map((l) => `limit-${l.id}`), 'drill']);
  protected readonly unitLabel = unitLabel;

  protected readonly table = new ClientTable<HourRow>({
    // Rows for this channel and its limits only, built once per answer from the columns.
    rows: computed(() => hourRows(this.review(), this.channelId(), this.limits().map((l) => l.id))),
    filter: signal(''),
    text: (row) => row.hourStart,
    sortValue: (row) => row.hourStart,
    pageSize: 24,
  });

  protected readonly pageSizeOptions = [24, 48, 168];

  protected coverageText(row: HourRow): string {
    const coverage = row.channels[this.channelId()]?.coverage;
    return coverage === null || coverage === undefined ? '—' : `${formatNumber(coverage * 100, 0)} %`;
  }
}
