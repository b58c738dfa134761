import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable, map } from 'rxjs';

import type { Limit } from './permits-api';
import type { Channel, Stack } from './sites-api';

// Shapes of .tmp/contract-import.md "Review"; apps/api/src/modules/review/*.schemas.ts is the source of truth.

/** Status of a reading as stored (the data logger's own or set by a correction). */
export type ReadingStatus =
  | 'valid' | 'calibration' | 'maintenance' | 'fault' | 'out_of_range' | 'not_operating'
  | 'startup_shutdown' | 'substituted' | 'invalidated';

export type Verdict = 'compliant' | 'exceedance' | 'insufficient_data';

/** An hour's (or a day's) value of a channel, in the channel's own unit and basis. */
export interface ChannelPeriodValue {
  value: number | null;
  /** `valid`, `invalid`, `not_operating` … */
  status: string;
  /** Share of the period covered by valid readings, 0–1. */
  coverage: number;
}

/** An hour's (or a day's) value in the limit's unit, basis and reference O2. */
export interface LimitPeriodValue {
  value: number | null;
  status: string;
}

export interface ReviewPeriodRow {
  /** ISO 8601 UTC instant the hour (or the local day) starts. */
  hourStart: string;
  channels: Record<string, ChannelPeriodValue>;
  limits: Record<string, LimitPeriodValue>;
}

export interface ReviewExceedance {
  start: string;
  end: string;
  peak: number;
  percentOfElv: number;
}

export interface ReviewHeadroom {
  remainingHours: number;
  /** The highest average the rest of the period may have for the limit still to be met, in the limit's unit. */
  maxAverageToStayCompliant: number | null;
  exceedanceCertain: boolean;
}

export interface ReviewLimit {
  limit: Limit;
  verdict: Verdict;
  availabilityPercent: number | null;
  invalidDays: number;
  exceedances: ReviewExceedance[];
  /** Periods above the near-miss share of the ELV but not above it (a count or a list). */
  nearMisses: number | unknown[];
  headroom: ReviewHeadroom | null;
}

export interface PlausibilityFlag {
  hourStart: string;
  expectedCo2PercentDry: number | null;
  measuredCo2PercentDry: number | null;
  deviationPercent: number | null;
}

export interface Review {
  stack: Stack;
  from: string;
  to: string;
  /** The site's IANA time zone: days and months follow its calendar. */
  timeZone: string;
  channels: Channel[];
  hourly: ReviewPeriodRow[];
  daily: ReviewPeriodRow[];
  limits: ReviewLimit[];
  plausibility: PlausibilityFlag[];
}

/** A stored reading with the import that brought it (raw rows stay; corrections supersede). */
export interface RawReading {
  id: number | string;
  channelId?: string;
  t: string;
  value: number | null;
  status: ReadingStatus | string;
  importId: string | null;
  /** The import's file name, when the API includes it. */
  importFileName?: string | null;
  createdAt?: string;
  createdBy?: string | null;
  createdByName?: string | null;
  supersededAt: string | null;
  supersededBy?: number | string | null;
  reason: string | null;
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

/** Hourly results, verdicts and raw readings of a stack (`data:read`), and corrections (`data:correct`). */
@Injectable({ providedIn: 'root' })
export class ReviewApi {
  private readonly http = inject(HttpClient);

  /** `from`/`to` as ISO 8601 instants (from inclusive, to exclusive). */
  review(stackId: string, from: string, to: string): Observable<Review> {
    const params = new HttpParams().set('from', from).set('to', to);
    return this.http.get<Review>(`/api/stacks/${stackId}/review`, { params });
  }

  /** Raw readings of a channel, oldest first (accepts a bare array or a `{ items }` page). */
  readings(channelId: string, query: ReadingsQuery): Observable<RawReading[]> {
    let params = new HttpParams().set('from', query.from).set('to', query.to);
    if (query.includeSuperseded) params = params.set('includeSuperseded', 'true');
    return this.http
      .get<{ items: RawReading[] } | RawReading[]>(`/api/channels/${channelId}/readings`, { params })
      .pipe(map((body) => (Array.isArray(body) ? body : body.items)));
  }

  correct(channelId: string, body: CorrectionBody): Observable<unknown> {
    return this.http.post<unknown>(`/api/channels/${channelId}/corrections`, body);
  }
}
