import 'chartjs-adapter-date-fns';

import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { ChartData, ChartDataset, ChartOptions, Plugin, ScatterDataPoint } from 'chart.js';
import { BaseChartDirective } from 'ng2-charts';

import type { Review } from '../../../core/api/review-api';
import { channelLabel } from '../../../shared/channel-label';
import { unitLabel } from '../../../shared/setup-labels';
import { formatZoned } from '../../../shared/time/zoned-time';
import { dailyPoints, hourlyPoints, invalidRanges } from '../review-series';

const hourMs = 3_600_000;

/** Hex colours: the canvas cannot read the theme's CSS variables. Chosen for contrast on white. */
const colours = {
  measured: '#6b7a8f',
  corrected: '#1f5fa8',
  daily: '#0f7b5f',
  elv: '#b3261e',
  invalidFill: 'rgba(179, 38, 30, 0.12)',
};

type Point = ScatterDataPoint;

/**
 * Raw and corrected hourly values, the daily averages and the ELV line over the period, with
 * hours that are not valid shaded. Chart.js draws on a canvas and sets sizes through the CSSOM,
 * so it adds no <style> element or style attribute the CSP would block.
 */
@Component({
  selector: 'fl-review-chart',
  imports: [BaseChartDirective],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="chart-box">
      <canvas baseChart type="line" [data]="data()" [options]="options()" [plugins]="plugins" role="img" [attr.aria-label]="description()"></canvas>
    </div>
  `,
  styles: `
    .chart-box {
      position: relative;
      height: 360px;
      width: 100%;
    }
  `,
})
export class ReviewChart {
  readonly review = input.required<Review>();
  readonly channelId = input<string | null>(null);
  readonly limitId = input<string | null>(null);

  private readonly channel = computed(() => this.review().channels.find((c) => c.id === this.channelId()) ?? null);
  private readonly limit = computed(() => this.review().limits.find((l) => l.limit.id === this.limitId())?.limit ?? null);
  private readonly shaded = computed(() => invalidRanges(this.review(), this.channelId(), this.limitId()));

  protected readonly data = computed<ChartData<'line', Point[]>>(() => {
    const review = this.review();
    const channel = this.channel();
    const limit = this.limit();
    const datasets: ChartDataset<'line', Point[]>[] = [];
    if (channel) {
      datasets.push({
        label: `Hourly, as measured (${unitLabel(channel.unit)}, ${channel.basis})`,
        data: hourlyPoints(review.hourly, review.hourly.channels[channel.id]?.value),
        yAxisID: limit ? 'measured' : 'y',
        borderColor: colours.measured,
        backgroundColor: colours.measured,
        borderWidth: 1,
        pointRadius: 0,
        spanGaps: false,
      });
    }
    if (limit) {
      const unit = unitLabel(limit.unit);
      datasets.push({
        label: `Hourly, corrected (${unit}${limit.referenceO2Percent !== null ? `, ${limit.referenceO2Percent} % O2` : ''})`,
        data: hourlyPoints(review.hourly, review.hourly.limits[limit.id]?.value),
        yAxisID: 'y',
        borderColor: colours.corrected,
        backgroundColor: colours.corrected,
        borderWidth: 1.5,
        pointRadius: 0,
        spanGaps: false,
      });
      const daily = dailyPoints(review, limit.id);
      // The step of the last day runs to the end of the period.
      if (daily.length) daily.push({ x: Date.parse(review.to), y: daily[daily.length - 1].y });
      datasets.push({
        label: `Daily average, corrected (${unit})`,
        data: daily,
        yAxisID: 'y',
        // The day's average holds from its start until the next day starts.
        stepped: 'after',
        borderColor: colours.daily,
        backgroundColor: colours.daily,
        borderWidth: 2,
        pointRadius: 0,
        spanGaps: false,
      });
      datasets.push({
        label: `ELV ${limit.elv} ${unit}`,
        data: [
          { x: Date.parse(review.from), y: limit.elv },
          { x: Date.parse(review.to), y: limit.elv },
        ],
        yAxisID: 'y',
        borderColor: colours.elv,
        backgroundColor: colours.elv,
        borderDash: [6, 4],
        borderWidth: 2,
        pointRadius: 0,
      });
    }
    // An empty dataset only for the legend: it explains the shading.
    datasets.push({ label: 'Hours not valid (shaded)', data: [], backgroundColor: colours.invalidFill, borderColor: colours.invalidFill, pointRadius: 0 });
    return { datasets };
  });

  protected readonly options = computed<ChartOptions<'line'>>(() => {
    const review = this.review();
    const timeZone = review.timeZone;
    const channel = this.channel();
    const limit = this.limit();
    const spanMs = Date.parse(review.to) - Date.parse(review.from);
    const tickFormat = new Intl.DateTimeFormat('en-GB', spanMs > 3 * 24 * hourMs ? { timeZone, day: 'numeric', month: 'short' } : { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23' });
    return {
      responsive: true,
      maintainAspectRatio: false,
      animation: false,
      parsing: false,
      normalized: true,
      interaction: { mode: 'nearest', axis: 'x', intersect: false },
      scales: {
        x: {
          type: 'time',
          min: Date.parse(review.from),
          max: Date.parse(review.to),
          ticks: { maxRotation: 0, autoSkip: true, callback: (value) => tickFormat.format(Number(value)) },
        },
        y: {
          position: 'left',
          beginAtZero: true,
          title: { display: true, text: limit ? `${limit.pollutant} ${unitLabel(limit.unit)}` : channel ? channelLabel(channel) : '' },
        },
        ...(limit && channel
          ? {
              measured: {
                position: 'right' as const,
                beginAtZero: true,
                grid: { drawOnChartArea: false },
                title: { display: true, text: `Measured ${unitLabel(channel.unit)}` },
              },
            }
          : {}),
      },
      plugins: {
        legend: { position: 'bottom' },
        tooltip: {
          callbacks: {
            title: (items) => (items.length ? formatZoned(items[0].parsed.x ?? 0, timeZone) : ''),
          },
        },
      },
    };
  });

  protected readonly description = computed(() => {
    const limit = this.limit();
    const channel = this.channel();
    const subject = limit ? `${limit.pollutant} against its ELV of ${limit.elv} ${unitLabel(limit.unit)}` : channel ? channelLabel(channel) : 'no channel';
    return `Chart of hourly values of ${subject}, ${this.shaded().length} shaded runs of hours that are not valid. The table below lists the same values.`;
  });

  /** Shades the hours that are not valid, behind the lines. */
  protected readonly plugins: Plugin<'line'>[] = [
    {
      id: 'flInvalidShading',
      beforeDatasetsDraw: (chart) => {
        const x = chart.scales['x'];
        const area = chart.chartArea;
        if (!x || !area) return;
        const context = chart.ctx;
        context.save();
        context.fillStyle = colours.invalidFill;
        for (const [start, end] of this.shaded()) {
          const left = Math.max(area.left, x.getPixelForValue(start));
          const right = Math.min(area.right, x.getPixelForValue(end));
          if (right > left) context.fillRect(left, area.top, right - left, area.bottom - area.top);
        }
        context.restore();
      },
    },
  ];
}
