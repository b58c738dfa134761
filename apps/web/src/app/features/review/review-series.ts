import type { ScatterDataPoint } from 'chart.js';

import type { Column, Review, ReviewHourly } from '../../core/api/review-api';

/*
 * Reads the review's column series for the chart and the table. The API sends one array per
 * field; the chart wants points and the table wants rows, so each is built here, in one pass,
 * only for the channel and limits on screen.
 */

/** An hour's value of a channel, decoded from the columns. */
export interface ChannelHour {
  value: number | null;
  /** `valid`, `invalid`, `not_operating` … */
  status: string;
  /** Share of the hour covered by valid readings, 0–1. */
  coverage: number | null;
  reason: string | null;
}

/** An hour's value of a limit, decoded from the columns. */
export interface LimitHour {
  value: number | null;
  status: string;
  reason: string | null;
}

/** One row of the hourly table: the hour, the channel's value and its limits' values. */
export interface HourRow {
  /** ISO 8601 UTC instant the hour starts. */
  hourStart: string;
  channels: Record<string, ChannelHour>;
  limits: Record<string, LimitHour>;
}

/** Start of hour i, epoch ms. */
export function hourStartMs(hourly: ReviewHourly, i: number): number {
  return hourly.fromMs + i * hourly.stepMs;
}

function word(legend: readonly string[], code: number | null | undefined): string | null {
  return code === null || code === undefined ? null : (legend[code] ?? null);
}

function reasonWord(legend: readonly string[], code: number | null | undefined): string | null {
  const reason = word(legend, code);
  return reason === 'none' ? null : reason;
}

/**
 * The table's rows: every hour of the period, with the channel's entry and those of the given
 * limits where an hour is stored (an hour without one has no entry, as the table shows "—").
 */
export function hourRows(review: Review, channelId: string, limitIds: readonly string[]): HourRow[] {
  const hourly = review.hourly;
  const { statusLegend, reasonLegend } = hourly;
  const channel = hourly.channels[channelId];
  const limits = limitIds.map((id) => [id, hourly.limits[id]] as const).filter(([, columns]) => columns !== undefined);
  const rows: HourRow[] = new Array(hourly.count);
  for (let i = 0; i < hourly.count; i++) {
    const row: HourRow = { hourStart: new Date(hourStartMs(hourly, i)).toISOString(), channels: {}, limits: {} };
    const status = word(statusLegend, channel?.status[i]);
    if (channel && status !== null) {
      row.channels[channelId] = { value: channel.value[i] ?? null, status, coverage: channel.coverage[i] ?? null, reason: reasonWord(reasonLegend, channel.reason[i]) };
    }
    for (const [id, columns] of limits) {
      const limitStatus = word(statusLegend, columns!.status[i]);
      if (limitStatus !== null) row.limits[id] = { value: columns!.value[i] ?? null, status: limitStatus, reason: reasonWord(reasonLegend, columns!.reason[i]) };
    }
    rows[i] = row;
  }
  return rows;
}

/**
 * Chart points of an hourly column. NaN, not null, marks an hour without a value: with parsing
 * off, Chart.js leaves a gap there.
 */
export function hourlyPoints(hourly: ReviewHourly, values: Column | undefined): ScatterDataPoint[] {
  const points: ScatterDataPoint[] = new Array(hourly.count);
  for (let i = 0; i < hourly.count; i++) points[i] = { x: hourStartMs(hourly, i), y: values?.[i] ?? NaN };
  return points;
}

/** Chart points of a limit's daily (measured) averages, one at the start of each day. */
export function dailyPoints(review: Review, limitId: string): ScatterDataPoint[] {
  const values = review.daily.limits[limitId]?.value;
  return review.daily.dayStart.map((start, k) => ({ x: Date.parse(start), y: values?.[k] ?? NaN }));
}

/** Runs of consecutive hours whose status is not valid, as [start, end) in epoch ms. */
export function invalidRanges(review: Review, channelId: string | null, limitId: string | null): [number, number][] {
  const hourly = review.hourly;
  const valid = hourly.statusLegend.indexOf('valid');
  const channelStatus = channelId ? hourly.channels[channelId]?.status : undefined;
  const limitStatus = limitId ? hourly.limits[limitId]?.status : undefined;
  const notValid = (status: Column | undefined, i: number) => {
    const code = status?.[i];
    return code !== null && code !== undefined && code !== valid;
  };
  const ranges: [number, number][] = [];
  for (let i = 0; i < hourly.count; i++) {
    if (!notValid(channelStatus, i) && !notValid(limitStatus, i)) continue;
    const start = hourStartMs(hourly, i);
    const last = ranges[ranges.length - 1];
    if (last && last[1] === start) last[1] = start + hourly.stepMs;
    else ranges.push([start, start + hourly.stepMs]);
  }
  return ranges;
}

/** Whether any channel has a value in the period. */
export function hasValues(review: Review): boolean {
  return Object.values(review.hourly.channels).some((columns) => columns.value.some((v) => v !== null));
}
