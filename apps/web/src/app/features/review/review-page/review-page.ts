import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { Router, RouterLink } from '@angular/router';
import { catchError, forkJoin, of, switchMap } from 'rxjs';

import { ImportsApi } from '../../../core/api/imports-api';
import { Review, ReviewApi, ReviewLimit } from '../../../core/api/review-api';
import { Site, SitesApi, StackWithChannels } from '../../../core/api/sites-api';
import { Auth } from '../../../core/auth/auth';
import { CalcCaution } from '../../../shared/calc-caution';
import { channelLabel } from '../../../shared/channel-label';
import { formatNumber } from '../../../shared/format-number';
import { pollutants } from '../../../shared/setup-labels';
import { StackPicker } from '../../../shared/stack-picker/stack-picker';
import { MonthKey, formatZoned, isMonthKey, monthKeyOf, monthLabel, shiftMonth, zonedMonthRange } from '../../../shared/time/zoned-time';
import { DailyTable } from '../daily-table/daily-table';
import { HourlyTable } from '../hourly-table/hourly-table';
import { LimitVerdicts } from '../limit-verdicts/limit-verdicts';
import { ReadingsPanel } from '../readings-panel/readings-panel';
import { ReviewChart } from '../review-chart/review-chart';
import { hasValues } from '../review-series';

/**
 * The limits in the order people read a permit's table: by pollutant as the permit form lists
 * them (NOx, SO2, CO, dust …), the API's order within a pollutant. The first one is what the
 * chart and the hourly table open on.
 */
export function orderLimits(limits: readonly ReviewLimit[]): ReviewLimit[] {
  const rank = (entry: ReviewLimit) => {
    const index = (pollutants as readonly string[]).indexOf(entry.limit.pollutant);
    return index === -1 ? pollutants.length : index;
  };
  // Array.prototype.sort is stable, so limits of one pollutant keep the API's order.
  return [...limits].sort((a, b) => rank(a) - rank(b));
}

interface StackContext {
  stack: StackWithChannels;
  site: Site | null;
}

/**
 * A stack's month against its permit: the chart, the verdict of every applicable limit, the hourly
 * values with status and coverage, plausibility flags, and the drill-down to raw readings.
 */
@Component({
  selector: 'fl-review-page',
  imports: [
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatSelectModule,
    RouterLink,
    CalcCaution,
    StackPicker,
    DailyTable,
    HourlyTable,
    LimitVerdicts,
    ReadingsPanel,
    ReviewChart,
  ],
  templateUrl: './review-page.html',
  styleUrl: './review-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ReviewPage {
  private readonly sitesApi = inject(SitesApi);
  private readonly importsApi = inject(ImportsApi);
  private readonly reviewApi = inject(ReviewApi);
  private readonly router = inject(Router);
  private readonly auth = inject(Auth);

  /** From the route `review/stacks/:stackId`. */
  readonly stackId = input<string | undefined>(undefined);
  /** From the query string `?month=2026-11`. */
  readonly month = input<string | undefined>(undefined);

  protected readonly context = signal<StackContext | null>(null);
  protected readonly stackStatus = signal<'none' | 'loading' | 'loaded' | 'failed'>('none');
  protected readonly timeZone = computed(() => this.context()?.site?.timeZone ?? 'UTC');
  /** The month asked for (from the URL or the month controls); null lets the API pick the latest with data. */
  private readonly requestedMonth = signal<MonthKey | null>(null);
  /** The month on screen, as the API answered it. */
  protected readonly chosenMonth = computed<MonthKey | null>(() => {
    const review = this.review();
    return review ? monthKeyOf(review.from, review.timeZone) : this.requestedMonth();
  });
  protected readonly review = signal<Review | null>(null);
  protected readonly reviewStatus = signal<'idle' | 'loading' | 'loaded' | 'failed'>('idle');
  private readonly reloadKey = signal(0);

  protected readonly canCorrect = computed(() => this.auth.can('data:correct'));
  protected readonly canImport = computed(() => this.auth.can('data:import'));

  protected readonly chosenChannelId = signal<string | null>(null);
  protected readonly chosenLimitId = signal<string | null>(null);
  protected readonly drillHour = signal<string | null>(null);

  protected readonly limits = computed(() => orderLimits(this.review()?.limits ?? []));
  protected readonly channels = computed(() => this.review()?.channels ?? []);
  protected readonly channelId = computed(() => {
    const channels = this.channels();
    const chosen = this.chosenChannelId();
    if (chosen && channels.some((c) => c.id === chosen)) return chosen;
    // Start with the channel of the first limit: that is what the permit is about.
    const firstLimitChannel = this.limits().find((entry) => entry.channelId)?.channelId;
    return (channels.find((c) => c.id === firstLimitChannel) ?? channels[0])?.id ?? null;
  });
  protected readonly channel = computed(() => this.channels().find((c) => c.id === this.channelId()) ?? null);
  protected readonly limitsOfChannel = computed(() => this.limits().filter((entry) => entry.channelId === this.channelId()));
  protected readonly limitId = computed(() => {
    const chosen = this.chosenLimitId();
    const limits = this.limitsOfChannel();
    if (chosen && limits.some((entry) => entry.limit.id === chosen)) return chosen;
    return limits[0]?.limit.id ?? null;
  });
  protected readonly plausibility = computed(() =>
    (this.review()?.plausibility ?? [])
      .slice()
      .sort((a, b) => Math.abs(b.deviationPercent) - Math.abs(a.deviationPercent)),
  );
  /**
   * Whether the month holds any stored hour: a value, or an hour judged without one (all readings
   * invalidated, say), which still has to be shown so it can be drilled into and corrected.
   */
  protected readonly hasData = computed(() => {
    const review = this.review();
    if (!review) return false;
    return hasValues(review) || Object.values(review.hourly.channels).some((columns) => columns.status.some((code) => code !== null));
  });

  protected readonly channelLabel = channelLabel;
  protected readonly formatNumber = formatNumber;
  protected readonly formatZoned = formatZoned;
  protected readonly monthLabel = monthLabel;

  constructor() {
    effect((onCleanup) => {
      const stackId = this.stackId();
      untracked(() => {
        this.context.set(null);
        this.review.set(null);
        this.drillHour.set(null);
        this.reviewStatus.set('idle');
      });
      if (!stackId) {
        this.stackStatus.set('none');
        return;
      }
      this.stackStatus.set('loading');
      const subscription = this.sitesApi
        .getStack(stackId)
        .pipe(switchMap((stack) => forkJoin({ stack: of(stack), site: this.sitesApi.getSite(stack.siteId).pipe(catchError(() => of(null))) })))
        .subscribe({
          next: (context) => {
            this.context.set(context);
            this.stackStatus.set('loaded');
          },
          error: () => this.stackStatus.set('failed'),
        });
      onCleanup(() => subscription.unsubscribe());
    });

    // The month named in the URL; without one the API answers with the latest month holding data.
    effect(() => {
      const month = this.month();
      untracked(() => this.requestedMonth.set(isMonthKey(month) ? month : null));
    });

    effect((onCleanup) => {
      const context = this.context();
      const month = this.requestedMonth();
      this.reloadKey();
      if (!context) return;
      const range = month ? zonedMonthRange(month, this.timeZone()) : null;
      this.reviewStatus.set('loading');
      const subscription = this.reviewApi
        .review(context.stack.id, range ? { from: range.from.toISOString(), to: range.to.toISOString() } : undefined)
        .subscribe({
          next: (review) => {
            this.review.set(review);
            this.reviewStatus.set('loaded');
          },
          error: () => {
            this.review.set(null);
            this.reviewStatus.set('failed');
          },
        });
      onCleanup(() => subscription.unsubscribe());
    });
  }

  protected chooseStack(stackId: string): void {
    void this.router.navigate(['/review/stacks', stackId]);
  }

  protected goToMonth(month: string): void {
    if (!isMonthKey(month)) return;
    this.drillHour.set(null);
    void this.router.navigate([], { queryParams: { month }, queryParamsHandling: 'merge' });
    // Also set it here: the URL update reaches the input only after navigation finishes.
    this.requestedMonth.set(month);
  }

  protected shiftMonth(delta: number): void {
    const month = this.chosenMonth();
    if (month) this.goToMonth(shiftMonth(month, delta));
  }

  protected onMonthInput(event: Event): void {
    this.goToMonth((event.target as HTMLInputElement).value);
  }

  protected templateUrl(stackId: string): string {
    return this.importsApi.templateUrl(stackId);
  }

  protected onCorrected(): void {
    this.reloadKey.update((n) => n + 1);
  }
}
