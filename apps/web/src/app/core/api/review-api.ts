import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';

import type { Limit } from './permits-api';

// Shapes of apps/api/src/modules/review/review.schemas.ts (the source of truth).

/** Status of a reading as stored (the data logger's own or set by a correction). */
export type ReadingStatus =
  | 'valid' | 'calibration' | 'maintenance' | 'fault' | 'out_of_range' | 'not_operating'
  | 'startup_shutdown' | 'substituted' | 'invalidated';

export type Verdict = 'compliant' | 'exceedance' | 'insufficient_data';

/** A channel as the review describes it (the set-up's Channel carries more). */
export interface ReviewChannel {
  id: string;
  parameter: string;
  unit: string;
  basis: string;
  conditions: string;
  intervalMinutes: number;
}

/**
 * The hourly and daily series travel as columns: per channel and per limit one array per field,
 * index i describing the i-th hour (day). Statuses and reasons are indexes into the legend sent
 * beside them; a null status means no stored value for that hour (the other fields are null too).
 * `features/review/review-series.ts` reads them for the chart and the table.
 */
export type Column = (number | null)[];

/** A channel's hours, in the channel's own unit and basis. */
export interface HourlyChannelColumns {
  value: Column;
  /** Index in `statusLegend` (`valid`, `invalid`, `not_operating` …). */
  status: Column;
  /** Share of the hour covered by valid readings, 0–1, rounded to 0.001. */
  coverage: Column;
  /** Index in `reasonLegend`; 0 is `none`. */
  reason: Column;
}

/** A limit's hours in the limit's unit, basis and reference O2. */
export interface HourlyLimitColumns {
  value: Column;
  status: Column;
  reason: Column;
  /** Only when asked for with `derivation`: the O2 each hour was corrected with, and its mass rate. */
  o2PercentDry?: Column;
  massKgPerHour?: Column;
}

/**
 * A column as the API sends statuses, reasons and coverages: entry i is `values[k]` where
 * `at[k] === i`, else `usual` (almost every hour is valid, has no reason and is fully covered).
 * `ReviewApi.review` expands them into full columns.
 */
export interface SparseColumn {
  usual: number | null;
  at: number[];
  values: (number | null)[];
}

/** The full column of `count` entries a sparse one stands for. */
export function expandColumn(sparse: SparseColumn, count: number): Column {
  const column: Column = new Array<number | null>(count).fill(sparse.usual);
  for (let k = 0; k < sparse.at.length; k++) column[sparse.at[k]!] = sparse.values[k]!;
  return column;
}

type Wire<T> = { [K in keyof T]: K extends 'status' | 'reason' | 'coverage' ? SparseColumn : T[K] };
/** The review as it travels (see `SparseColumn`). */
export type ReviewWire = Omit<Review, 'hourly'> & {
  hourly: Omit<ReviewHourly, 'channels' | 'limits'> & { channels: Record<string, Wire<HourlyChannelColumns>>; limits: Record<string, Wire<HourlyLimitColumns>> };
};

/** The review with every hourly column in full, as the screens read it. */
export function expandReview(wire: ReviewWire): Review {
  const { count } = wire.hourly;
  const channels: Record<string, HourlyChannelColumns> = {};
  for (const [id, c] of Object.entries(wire.hourly.channels)) {
    channels[id] = { ...c, status: expandColumn(c.status, count), reason: expandColumn(c.reason, count), coverage: expandColumn(c.coverage, count) };
  }
  const limits: Record<string, HourlyLimitColumns> = {};
  for (const [id, c] of Object.entries(wire.hourly.limits)) {
    limits[id] = { ...c, status: expandColumn(c.status, count), reason: expandColumn(c.reason, count) };
  }
  return { ...wire, hourly: { ...wire.hourly, channels, limits } };
}

/**
 * The hours of the period on a regular UTC grid: hour i starts at `fromMs + i · stepMs` (epoch ms),
 * i < count. Channels and limits without a stored hour in the period are left out.
 */
export interface ReviewHourly {
  fromMs: number;
  stepMs: number;
  count: number;
  statusLegend: string[];
  reasonLegend: string[];
  channels: Record<string, HourlyChannelColumns>;
  limits: Record<string, HourlyLimitColumns>;
}

/** The site's local calendar days, each bounded by its two local midnights (UTC instants). */
export interface ReviewDaily {
  dayStart: string[];
  dayEnd: string[];
  statusLegend: string[];
  channels: Record<string, { value: Column; status: Column; coverage: Column; validHours: Column; invalidHours: Column }>;
  /** `validatedValue` is the daily value after the confidence interval is subtracted, where the limit asks for it. */
  limits: Record<string, { value: Column; validatedValue: Column; status: Column; validHours: Column; invalidHours: Column }>;
}

/** A run of periods above the ELV (an exceedance) or above the near-miss share of it. */
export interface ReviewEvent {
  start: string;
  end: string;
  peak: number;
  peakAt: string;
  percentOfElv: number;
  threshold: number;
  periodCount: number;
}

export interface ReviewHeadroom {
  asOf: string;
  periodStart: string;
  periodEnd: string;
  remainingHours: number;
  averageSoFar: number | null;
  /** The highest average the rest of the period may have for the limit still to be met, in the limit's unit. */
  maxAverageToStayCompliant: number | null;
  exceedanceCertain: boolean;
  periodsAboveAllowedRemaining: number | null;
  note: string | null;
}

export interface ReviewLimit {
  limit: Limit;
  /** The channel the limit is judged on, when the stack has one for its pollutant. */
  channelId: string | null;
  verdict: Verdict;
  /** Why the verdict is what it is, in a sentence. */
  note: string;
  threshold: number;
  availabilityPercent: number | null;
  validHours: number;
  invalidHours: number;
  invalidDays: number;
  exceedances: ReviewEvent[];
  nearMisses: ReviewEvent[];
  share: { required: number; achieved: number | null; validPeriods: number; periodsAbove: number; allowedAbove: number } | null;
  headroom: ReviewHeadroom | null;
}

export interface PlausibilityFlag {
  hourStart: string;
  o2PercentDry: number;
  expectedCo2PercentDry: number;
  measuredCo2PercentDry: number;
  deviationPercent: number;
}

export interface Review {
  stack: { id: string; name: string; siteId: string; siteName: string };
  from: string;
  to: string;
  /** The site's IANA time zone: days and months follow its calendar. */
  timeZone: string;
  channels: ReviewChannel[];
  hourly: ReviewHourly;
  daily: ReviewDaily;
  limits: ReviewLimit[];
  plausibility: PlausibilityFlag[];
  plausibilityCheck: { co2MaxPercentDry: number | null; tolerancePercent: number; hoursChecked: number; note: string | null };
  computedAt: string | null;
  disclaimer: string;
}

/** A stored reading (raw rows stay; corrections supersede them). */
export interface RawReading {
  id: string;
  t: string;
  value: number | null;
  status: ReadingStatus | string;
  current: boolean;
  importId: string | null;
  /** Who wrote it: the person who made the correction, or the committer of its import. */
  createdBy: string | null;
  createdByName: string | null;
  createdAt: string;
  supersededAt: string | null;
  supersededBy: string | null;
  reason: string | null;
}

export interface ReadingsImport {
  id: string;
  fileName: string;
  sha256: string;
  state: string;
  uploadedAt: string;
  uploadedBy: string;
  committedAt: string | null;
  rolledBackAt: string | null;
}

export interface Readings {
  channel: { id: string; stackId: string; parameter: string; unit: string; basis: string; intervalMinutes: number };
  from: string;
  to: string;
  includeSuperseded: boolean;
  items: RawReading[];
  /** True when the API cut the list short. */
  truncated: boolean;
  /** The imports that brought the readings listed. */
  imports: ReadingsImport[];
  hours: { hourStart: string; value: number | null; status: string; coverage: number; reason: string | null; readingsValid: number; readingsTotal: number }[];
}

export interface ReadingsQuery {
  from: string;
  to: string;
  includeSuperseded?: boolean;
}

export type CorrectionAction = 'invalidate' | 'substitute';

export interface CorrectionBody {
  /** ISO 8601 instants: readings with from ≤ t < to are corrected. */
  from: string;
  to: string;
  action: CorrectionAction;
  /** The value each substituted reading takes, in the channel's unit. */
  valuePerReading?: number;
  reason: string;
}

export interface CorrectionResult {
  channelId: string;
  action: CorrectionAction;
  from: string;
  to: string;
  reason: string;
  valuePerReading: number | null;
  superseded: number;
  inserted: number;
  hoursRecomputed: number;
}

/** Hourly results, verdicts and raw readings of a stack (`data:read`), and corrections (`data:correct`). */
@Injectable({ providedIn: 'root' })
export class ReviewApi {
  private readonly http = inject(HttpClient);

  /**
   * `from`/`to` as ISO 8601 instants (from inclusive, to exclusive). Without them the API answers
   * with the site's calendar month that holds the latest data.
   */
  review(stackId: string, range?: { from: string; to: string }): Observable<Review> {
    const params = range ? new HttpParams().set('from', range.from).set('to', range.to) : undefined;
    return this.http.get<ReviewWire>(`/api/stacks/${stackId}/review`, { params }).pipe(map(expandReview));
  }

  /** Raw readings of a channel, oldest first, with the imports that brought them. */
  readings(channelId: string, query: ReadingsQuery): Observable<Readings> {
    let params = new HttpParams().set('from', query.from).set('to', query.to);
    if (query.includeSuperseded) params = params.set('includeSuperseded', 'true');
    return this.http.get<Readings>(`/api/channels/${channelId}/readings`, { params });
  }

  correct(channelId: string, body: CorrectionBody): Observable<CorrectionResult> {
    return this.http.post<CorrectionResult>(`/api/channels/${channelId}/corrections`, body);
  }
}
