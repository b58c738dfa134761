import { HttpClient, HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

import { ListPage, ListQuery, listParams } from './list-page';
import type { Basis, Regime, UnitType, VersionedUpdate } from './sites-api';
import type { FuelKind } from './fuels-api';

// Shapes of apps/api/src/modules/permits/{permits,limits}.schemas.ts (the source of truth).

export type Pollutant = 'NOx' | 'NO' | 'NO2' | 'SO2' | 'CO' | 'dust' | 'HCl' | 'HF' | 'TOC' | 'NH3' | 'Hg' | 'CO2';
export type LimitUnit = 'mg/Nm3' | 'ppm' | 'ug/Nm3' | 'lb/MMBtu' | 'ng/J' | 'kg/h' | 't/yr';
export type AveragingPeriod = 'hour' | 'half_hour' | 'day' | 'month' | 'year' | 'rolling_days' | 'rolling_hours' | 'block_hours';
export type ExcludableStatus = 'startup-shutdown' | 'substituted';

/** Every period ≤ factor × ELV, or at least `share` (0–1) of the periods ≤ factor × ELV. */
export type LimitCriterion =
  | { type: 'every_period'; factor: number }
  | { type: 'share_of_periods'; factor: number; share: number };

export interface PermitDocument {
  fileName: string;
  sizeBytes: number;
  sha256: string;
  uploadedAt: string;
}

export interface Permit {
  id: string;
  siteId: string;
  reference: string;
  authority: string;
  effectiveFrom: string;
  effectiveTo: string | null;
  document: PermitDocument | null;
  archivedAt: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface Limit {
  id: string;
  permitId: string;
  stackId: string | null;
  unitId: string | null;
  pollutant: Pollutant;
  elv: number;
  unit: LimitUnit;
  referenceO2Percent: number | null;
  ambientO2Percent: number;
  basis: Basis;
  period: AveragingPeriod;
  periodLength: number | null;
  operatingPeriodsOnly: boolean;
  criterion: LimitCriterion;
  confidenceIntervalPercent: number | null;
  nearMissPercent: number;
  correctOnlyWhenAbove: boolean;
  excludeStatuses: string[];
  minValidHoursPerDay: number | null;
  minData: Record<string, number> | null;
  effectiveFrom: string;
  effectiveTo: string | null;
  /** The limit in one plain sentence, written by the API. */
  summary: string;
  archivedAt: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface PermitDetail extends Permit {
  limits: Limit[];
}

export interface PermitInput {
  reference: string;
  authority: string;
  effectiveFrom: string;
  effectiveTo: string | null;
}

export interface LimitInput {
  stackId?: string | null;
  unitId?: string | null;
  pollutant: Pollutant;
  elv: number;
  unit: LimitUnit;
  referenceO2Percent: number | null;
  ambientO2Percent: 21 | 20.9;
  basis: Basis;
  period: AveragingPeriod;
  periodLength: number | null;
  operatingPeriodsOnly: boolean;
  criterion: LimitCriterion;
  confidenceIntervalPercent: number | null;
  nearMissPercent: number;
  correctOnlyWhenAbove: boolean;
  excludeStatuses: ExcludableStatus[];
  minValidHoursPerDay: number | null;
  effectiveFrom: string;
  effectiveTo: string | null;
}

export interface LimitDefaultsQuery {
  regime: Regime;
  unitType?: UnitType;
  fuelKind?: FuelKind;
}

/** Regime defaults that pre-fill a new limit; `source` says where they come from. */
export interface LimitDefaults {
  referenceO2Percent: number | null;
  ambientO2Percent: number;
  source: string;
}

/** The permit's PDF may be at most 20 MB (the API's MAX_PERMIT_DOCUMENT_BYTES). */
export const MAX_PERMIT_DOCUMENT_BYTES = 20 * 1024 * 1024;

/** Permits, their PDF and their limits. */
@Injectable({ providedIn: 'root' })
export class PermitsApi {
  private readonly http = inject(HttpClient);

  listPermits(siteId: string, query: ListQuery = {}): Observable<ListPage<Permit>> {
    return this.http.get<ListPage<Permit>>(`/api/sites/${siteId}/permits`, { params: listParams(query) });
  }

  getPermit(permitId: string): Observable<PermitDetail> {
    return this.http.get<PermitDetail>(`/api/permits/${permitId}`);
  }

  createPermit(siteId: string, body: PermitInput): Observable<Permit> {
    return this.http.post<Permit>(`/api/sites/${siteId}/permits`, body);
  }

  updatePermit(permitId: string, body: VersionedUpdate<PermitInput>): Observable<Permit> {
    return this.http.patch<Permit>(`/api/permits/${permitId}`, body);
  }

  archivePermit(permitId: string, version: number): Observable<Permit> {
    return this.http.post<Permit>(`/api/permits/${permitId}/archive`, { version });
  }

  /** Uploads the PDF (multipart field "file") and reports upload progress as HTTP events. */
  uploadDocument(permitId: string, file: File): Observable<HttpEvent<Permit>> {
    const body = new FormData();
    body.append('file', file, file.name);
    return this.http.put<Permit>(`/api/permits/${permitId}/document`, body, { reportProgress: true, observe: 'events' });
  }

  /** Where the browser opens the stored PDF. */
  documentUrl(permitId: string): string {
    return `/api/permits/${permitId}/document`;
  }

  createLimit(permitId: string, body: LimitInput): Observable<Limit> {
    return this.http.post<Limit>(`/api/permits/${permitId}/limits`, body);
  }

  updateLimit(limitId: string, body: VersionedUpdate<Omit<LimitInput, 'stackId' | 'unitId'>>): Observable<Limit> {
    return this.http.patch<Limit>(`/api/limits/${limitId}`, body);
  }

  archiveLimit(limitId: string, version: number): Observable<Limit> {
    return this.http.post<Limit>(`/api/limits/${limitId}/archive`, { version });
  }

  limitDefaults(query: LimitDefaultsQuery): Observable<LimitDefaults> {
    const params: Record<string, string> = { regime: query.regime };
    if (query.unitType) params['unitType'] = query.unitType;
    if (query.fuelKind) params['fuelKind'] = query.fuelKind;
    return this.http.get<LimitDefaults>('/api/limit-defaults', { params });
  }
}
