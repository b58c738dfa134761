import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

import type { ReviewLimit, Verdict } from '../../../core/api/review-api';
import { formatInUnit, formatNumber } from '../../../shared/format-number';
import { unitLabel } from '../../../shared/setup-labels';
import { formatZoned } from '../../../shared/time/zoned-time';

export const verdictLabels: Record<Verdict, string> = {
  compliant: 'Compliant',
  exceedance: 'Exceedance',
  insufficient_data: 'Not enough valid data',
};

const verdictIcons: Record<Verdict, string> = {
  compliant: 'check_circle',
  exceedance: 'error',
  insufficient_data: 'help',
};

/** Each applicable limit with its verdict for the period, data availability and headroom. */
@Component({
  selector: 'fl-limit-verdicts',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './limit-verdicts.html',
  styleUrl: './limit-verdicts.scss',
})
export class LimitVerdicts {
  readonly limits = input.required<readonly ReviewLimit[]>();
  readonly timeZone = input<string | null>(null);

  protected readonly formatNumber = formatNumber;
  protected readonly formatInUnit = formatInUnit;
  protected readonly formatZoned = formatZoned;
  protected readonly unitLabel = unitLabel;

  /** The verdict in words; a verdict this screen does not know yet is shown as the API wrote it. */
  protected verdictLabel(verdict: string): string {
    return (verdictLabels as Record<string, string>)[verdict] ?? verdict;
  }

  protected verdictIcon(verdict: string): string {
    return (verdictIcons as Record<string, string>)[verdict] ?? 'info';
  }

}
