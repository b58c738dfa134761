import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { Permit, PermitsApi } from '../../../core/api/permits-api';
import { SiteDetail, SitesApi } from '../../../core/api/sites-api';
import { canEditSetup } from '../../../shared/can-edit-setup';
import { ClientTable } from '../../../shared/client-table';
import { FilterField } from '../../../shared/filter-field';
import { LoadState, LoadStatus } from '../../../shared/load-state';
import { namesOf } from '../../../shared/names-of';
import { PageHeader } from '../../../shared/page-header';
import { ReadOnlyField, ReadOnlyFields } from '../../../shared/read-only-fields';
import {
  analyserRangeLabel,
  basisLabels,
  fFactorSourceLabels,
  fuelTypeLabels,
  parameterLabels,
  regimeLabels,
  unitLabel,
  unitTypeLabels,
} from '../../../shared/setup-labels';
import { TablePager } from '../../../shared/table-pager';
import { countryName } from '../site-form/site-form';

export interface UnitRow {
  id: string;
  name: string;
  type: string;
  ratedThermalInputMWth: number;
  fuels: string;
  inService: string;
}

export interface StackRow {
  id: string;
  name: string;
  units: string;
  heightM: number | null;
  channels: string;
}

export interface ChannelRow {
  id: string;
  stackId: string;
  stack: string;
  parameter: string;
  unit: string;
  basis: string;
  intervalMinutes: number;
  range: string;
}

export interface FuelRow {
  id: string;
  name: string;
  type: string;
  validFrom: string;
  fFactors: string;
}

export interface PermitRow {
  id: string;
  reference: string;
  authority: string;
  effectiveFrom: string;
  effectiveTo: string;
  document: string;
}

const joinText = (row: object): string => Object.values(row).join(' ');
const byColumn = <T extends object>(row: T, column: string): string | number | null =>
  (row as Record<string, unknown>)[column] as string | number | null;

/**
 * One site in one place: its emission units, stacks and their monitored channels, fuels and
 * permits, each in a table that sorts, filters and pages. People with `site:write` get the
 * buttons that add and change records; everyone else reads.
 */
@Component({
  selector: 'fl-site-page',
  imports: [
    DecimalPipe,
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatButtonModule,
    MatIconModule,
    FilterField,
    LoadState,
    PageHeader,
    ReadOnlyFields,
    TablePager,
  ],
  templateUrl: './site-page.html',
  styleUrl: './site-page.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SitePage {
  private readonly sitesApi = inject(SitesApi);
  private readonly permitsApi = inject(PermitsApi);

  readonly siteId = input.required<string>();

  protected readonly canEdit = canEditSetup();
  protected readonly status = signal<LoadStatus>('loading');
  protected readonly site = signal<SiteDetail | null>(null);
  private readonly permits = signal<Permit[]>([]);
  protected readonly filter = signal('');

  protected readonly siteFields = computed<ReadOnlyField[]>(() => {
    const site = this.site();
    if (!site) return [];
    return [
      { label: 'Regulatory regime', value: regimeLabels[site.regime] },
      { label: 'Country', value: `${countryName(site.country) ?? site.country} (${site.country})` },
      { label: 'Time zone', value: site.timeZone },
      { label: 'Address', value: site.address ?? '' },
    ];
  });

  private readonly unitRows = computed<UnitRow[]>(() => {
    const site = this.site();
    if (!site) return [];
    return site.units.map((unit) => ({
      id: unit.id,
      name: unit.name,
      type: unitTypeLabels[unit.unitType],
      ratedThermalInputMWth: unit.ratedThermalInputMWth,
      fuels: namesOf(unit.fuelIds, site.fuels),
      inService: unit.inServiceTo ? `${unit.inServiceFrom} – ${unit.inServiceTo}` : `since ${unit.inServiceFrom}`,
    }));
  });

  private readonly stackRows = computed<StackRow[]>(() => {
    const site = this.site();
    if (!site) return [];
    return site.stacks.map((stack) => ({
      id: stack.id,
      name: stack.name,
      units: namesOf(stack.unitIds, site.units),
      heightM: stack.heightM,
      channels: stack.channels.map((channel) => channel.parameter).join(', '),
    }));
  });

  private readonly channelRows = computed<ChannelRow[]>(() =>
    (this.site()?.stacks ?? []).flatMap((stack) =>
      stack.channels.map((channel) => ({
        id: channel.id,
        stackId: stack.id,
        stack: stack.name,
        parameter: parameterLabels[channel.parameter],
        unit: unitLabel(channel.unit),
        basis: basisLabels[channel.basis],
        intervalMinutes: channel.intervalMinutes,
        range: analyserRangeLabel(channel),
      })),
    ),
  );

  private readonly fuelRows = computed<FuelRow[]>(() =>
    (this.site()?.fuels ?? []).map((fuel) => ({
      id: fuel.id,
      name: fuel.name,
      type: fuelTypeLabels[fuel.fuelType],
      validFrom: fuel.currentAnalysis?.validFrom ?? '',
      fFactors: fuel.currentAnalysis ? fFactorSourceLabels[fuel.currentAnalysis.fFactorSource] : 'No analysis yet',
    })),
  );

  private readonly permitRows = computed<PermitRow[]>(() =>
    this.permits().map((permit) => ({
      id: permit.id,
      reference: permit.reference,
      authority: permit.authority,
      effectiveFrom: permit.effectiveFrom,
      effectiveTo: permit.effectiveTo ?? '',
      document: permit.document ? permit.document.fileName : '',
    })),
  );

  private table<T extends object>(rows: () => T[], active: string) {
    return new ClientTable<T>({
      rows: computed(rows),
      filter: this.filter,
      text: joinText,
      sortValue: byColumn,
      initialSort: { active, direction: 'asc' },
    });
  }

  protected readonly units = this.table(() => this.unitRows(), 'name');
  protected readonly stacks = this.table(() => this.stackRows(), 'name');
  protected readonly channels = this.table(() => this.channelRows(), 'stack');
  protected readonly fuels = this.table(() => this.fuelRows(), 'name');
  protected readonly permitTable = this.table(() => this.permitRows(), 'effectiveFrom');

  protected readonly unitColumns = ['name', 'type', 'ratedThermalInputMWth', 'fuels', 'inService'];
  protected readonly stackColumns = ['name', 'units', 'heightM', 'channels'];
  protected readonly channelColumns = ['stack', 'parameter', 'unit', 'basis', 'intervalMinutes', 'range'];
  protected readonly fuelColumns = ['name', 'type', 'validFrom', 'fFactors'];
  protected readonly permitColumns = ['reference', 'authority', 'effectiveFrom', 'effectiveTo', 'document'];

  constructor() {
    effect(() => void this.load(this.siteId()));
  }

  private async load(siteId: string): Promise<void> {
    this.status.set('loading');
    // The heading and its commands name the site only once it has loaded.
    this.site.set(null);
    try {
      const [site, permits] = await Promise.all([
        firstValueFrom(this.sitesApi.getSite(siteId)),
        firstValueFrom(this.permitsApi.listPermits(siteId, { limit: 200, sort: 'effectiveFrom', order: 'desc' })),
      ]);
      this.site.set(site);
      this.permits.set(permits.items);
      this.status.set('ready');
    } catch {
      this.status.set('failed');
    }
  }

  protected onFilter(text: string): void {
    this.filter.set(text);
    for (const table of [this.units, this.stacks, this.channels, this.fuels, this.permitTable]) table.pageIndex.set(0);
  }
}
