import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { Observable } from 'rxjs';

import type { Fuel } from './fuels-api';
import { ListPage, ListQuery, listParams } from './list-page';

// Shapes of apps/api/src/modules/{sites,units,stacks,channels}/*.schemas.ts (the source of truth).

export type Regime = 'eu_ied' | 'us_epa' | 'other';
export type UnitType = 'boiler' | 'process_heater' | 'kiln' | 'gas_turbine' | 'engine' | 'incinerator' | 'other';
export type ChannelParameter =
  | 'NOx' | 'NO' | 'NO2' | 'SO2' | 'CO' | 'dust' | 'HCl' | 'HF' | 'TOC' | 'NH3' | 'Hg' | 'CO2'
  | 'O2' | 'H2O' | 'flow' | 'temperature' | 'pressure' | 'load' | 'fuel_flow';
export type ChannelUnit = 'mg/Nm3' | 'ppm' | 'ug/Nm3' | '%' | 'Nm3/h' | 'm3/h' | 'scfh' | 'degC' | 'degF' | 'K' | 'kPa' | 'hPa' | 'MW' | 'kg/h' | 't/h';
export type Basis = 'wet' | 'dry';
export type Conditions = 'actual' | 'standard';

interface Versioned {
  id: string;
  archivedAt: string | null;
  version: number;
  createdAt: string;
  updatedAt: string;
}

export interface Site extends Versioned {
  name: string;
  /** IANA time zone, e.g. Europe/Berlin. */
  timeZone: string;
  /** ISO 3166-1 alpha-2. */
  country: string;
  regime: Regime;
  address: string | null;
}

export interface EmissionUnit extends Versioned {
  siteId: string;
  name: string;
  unitType: UnitType;
  ratedThermalInputMWth: number;
  /** YYYY-MM-DD */
  inServiceFrom: string;
  inServiceTo: string | null;
  fuelIds: string[];
}

export interface Channel extends Versioned {
  stackId: string;
  parameter: ChannelParameter;
  unit: ChannelUnit;
  basis: Basis;
  conditions: Conditions;
  rangeMin: number | null;
  rangeMax: number | null;
  intervalMinutes: number;
  /** The data logger's column name for this channel. */
  sourceLabel: string | null;
}

export interface Stack extends Versioned {
  siteId: string;
  name: string;
  heightM: number | null;
  diameterM: number | null;
  unitIds: string[];
}

export interface StackWithChannels extends Stack {
  channels: Channel[];
}

export interface SiteDetail extends Site {
  units: EmissionUnit[];
  stacks: StackWithChannels[];
  fuels: Fuel[];
  counts: { units: number; stacks: number; channels: number; fuels: number; permits: number };
}

export interface SiteInput {
  name: string;
  timeZone: string;
  country: string;
  regime: Regime;
  address: string | null;
}

export interface UnitInput {
  name: string;
  unitType: UnitType;
  ratedThermalInputMWth: number;
  inServiceFrom: string;
  inServiceTo: string | null;
  fuelIds: string[];
}

export interface StackInput {
  name: string;
  heightM: number | null;
  diameterM: number | null;
  unitIds: string[];
}

export interface ChannelInput {
  parameter: ChannelParameter;
  unit: ChannelUnit;
  basis: Basis;
  conditions: Conditions;
  rangeMin: number | null;
  rangeMax: number | null;
  intervalMinutes: number;
  sourceLabel: string | null;
}

/** Updates name the version they were based on; a stale one answers 409 `stale_version`. */
export type VersionedUpdate<T> = Partial<T> & { version: number };

/** Sites, emission units, stacks and channels (`site:read` to read, `site:write` to change). */
@Injectable({ providedIn: 'root' })
export class SitesApi {
  private readonly http = inject(HttpClient);

  listSites(query: ListQuery = {}): Observable<ListPage<Site>> {
    return this.http.get<ListPage<Site>>('/api/sites', { params: listParams(query) });
  }

  getSite(siteId: string): Observable<SiteDetail> {
    return this.http.get<SiteDetail>(`/api/sites/${siteId}`);
  }

  createSite(body: SiteInput): Observable<Site> {
    return this.http.post<Site>('/api/sites', body);
  }

  updateSite(siteId: string, body: VersionedUpdate<SiteInput>): Observable<Site> {
    return this.http.patch<Site>(`/api/sites/${siteId}`, body);
  }

  archiveSite(siteId: string, version: number): Observable<Site> {
    return this.http.post<Site>(`/api/sites/${siteId}/archive`, { version });
  }

  getUnit(unitId: string): Observable<EmissionUnit> {
    return this.http.get<EmissionUnit>(`/api/units/${unitId}`);
  }

  createUnit(siteId: string, body: UnitInput): Observable<EmissionUnit> {
    return this.http.post<EmissionUnit>(`/api/sites/${siteId}/units`, body);
  }

  updateUnit(unitId: string, body: VersionedUpdate<UnitInput>): Observable<EmissionUnit> {
    return this.http.patch<EmissionUnit>(`/api/units/${unitId}`, body);
  }

  archiveUnit(unitId: string, version: number): Observable<EmissionUnit> {
    return this.http.post<EmissionUnit>(`/api/units/${unitId}/archive`, { version });
  }

  getStack(stackId: string): Observable<StackWithChannels> {
    return this.http.get<StackWithChannels>(`/api/stacks/${stackId}`);
  }

  createStack(siteId: string, body: StackInput): Observable<Stack> {
    return this.http.post<Stack>(`/api/sites/${siteId}/stacks`, body);
  }

  updateStack(stackId: string, body: VersionedUpdate<StackInput>): Observable<Stack> {
    return this.http.patch<Stack>(`/api/stacks/${stackId}`, body);
  }

  archiveStack(stackId: string, version: number): Observable<Stack> {
    return this.http.post<Stack>(`/api/stacks/${stackId}/archive`, { version });
  }

  createChannel(stackId: string, body: ChannelInput): Observable<Channel> {
    return this.http.post<Channel>(`/api/stacks/${stackId}/channels`, body);
  }

  updateChannel(channelId: string, body: VersionedUpdate<ChannelInput>): Observable<Channel> {
    return this.http.patch<Channel>(`/api/channels/${channelId}`, body);
  }

  archiveChannel(channelId: string, version: number): Observable<Channel> {
    return this.http.post<Channel>(`/api/channels/${channelId}/archive`, { version });
  }
}
