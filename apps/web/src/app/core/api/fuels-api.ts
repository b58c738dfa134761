import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

import { ListPage, ListQuery, listParams } from './list-page';
import type { VersionedUpdate } from './sites-api';

// Shapes of apps/api/src/modules/fuels/fuels.schemas.ts (the source of truth).

export type FuelType =
  | 'natural_gas' | 'propane' | 'butane' | 'fuel_oil' | 'bituminous_coal' | 'anthracite' | 'lignite'
  | 'wood' | 'wood_bark' | 'other_gas' | 'other_liquid' | 'other_solid';
export type FuelKind = 'gas' | 'liquid' | 'solid';
export type FFactorSource = 'computed' | 'method19_default';
export type GcvSource = 'measured' | 'correlation' | 'none';

/** As-fired mass %: C, H (excluding the hydrogen of moisture), O, N, S, moisture, ash. */
export type UltimateAnalysisInput = Record<'C' | 'H' | 'O' | 'N' | 'S' | 'moisture' | 'ash', number>;
/** mol %, components absent from the gas may be left out. */
export type GasCompositionInput = Partial<Record<'CH4' | 'C2H6' | 'C3H8' | 'C4H10' | 'CO' | 'H2' | 'CO2' | 'N2' | 'O2' | 'H2S' | 'H2O', number>>;

export interface FuelAnalysis {
  id: string;
  fuelId: string;
  validFrom: string;
  ultimate: Record<string, number> | null;
  composition: Record<string, number> | null;
  gcvMJPerKg: number | null;
  gcvMJPerNm3: number | null;
  gcvSource: GcvSource;
  fdDscfPerMMBtu: number;
  fwWscfPerMMBtu: number | null;
  fcScfPerMMBtu: number;
  fFactorSource: FFactorSource;
  createdBy: string | null;
  createdAt: string;
}

export interface Fuel {
  id: string;
  siteId: string;
  name: string;
  fuelType: FuelType;
  kind: FuelKind;
  currentAnalysis: FuelAnalysis | null;
  archivedAt: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface AnalysisInput {
  validFrom: string;
  ultimate?: UltimateAnalysisInput | null;
  composition?: GasCompositionInput | null;
  gcvMJPerKg?: number | null;
  gcvMJPerNm3?: number | null;
  fFactorSource?: FFactorSource;
}

export interface FuelInput {
  name: string;
  fuelType: FuelType;
  analysis?: AnalysisInput;
}

/** Fuels of a site and their analyses (history: a new analysis is a new record). */
@Injectable({ providedIn: 'root' })
export class FuelsApi {
  private readonly http = inject(HttpClient);

  listFuels(siteId: string, query: ListQuery = {}): Observable<ListPage<Fuel>> {
    return this.http.get<ListPage<Fuel>>(`/api/sites/${siteId}/fuels`, { params: listParams(query) });
  }

  getFuel(fuelId: string): Observable<Fuel> {
    return this.http.get<Fuel>(`/api/fuels/${fuelId}`);
  }

  createFuel(siteId: string, body: FuelInput): Observable<Fuel> {
    return this.http.post<Fuel>(`/api/sites/${siteId}/fuels`, body);
  }

  /** Name and type only: the analysis changes by adding a new one. */
  updateFuel(fuelId: string, body: VersionedUpdate<Pick<FuelInput, 'name' | 'fuelType'>>): Observable<Fuel> {
    return this.http.patch<Fuel>(`/api/fuels/${fuelId}`, body);
  }

  listAnalyses(fuelId: string, query: ListQuery = {}): Observable<ListPage<FuelAnalysis>> {
    return this.http.get<ListPage<FuelAnalysis>>(`/api/fuels/${fuelId}/analyses`, { params: listParams(query) });
  }

  addAnalysis(fuelId: string, body: AnalysisInput): Observable<FuelAnalysis> {
    return this.http.post<FuelAnalysis>(`/api/fuels/${fuelId}/analyses`, body);
  }

  archiveFuel(fuelId: string, version: number): Observable<Fuel> {
    return this.http.post<Fuel>(`/api/fuels/${fuelId}/archive`, { version });
  }
}
