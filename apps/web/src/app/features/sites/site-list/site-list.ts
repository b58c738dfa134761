import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatSortModule, Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { catchError, debounceTime, distinctUntilChanged, map, of, switchMap, tap } from 'rxjs';

import { ListQuery } from '../../../core/api/list-page';
import { Site, SitesApi } from '../../../core/api/sites-api';
import { Auth } from '../../../core/auth/auth';
import { canEditSetup } from '../../../shared/can-edit-setup';
import { FilterField } from '../../../shared/filter-field';
import { PageHeader } from '../../../shared/page-header';
import { regimeLabels } from '../../../shared/setup-labels';

/** Sort fields the API accepts for sites (SiteListQuery). */
const sortableColumns = ['name', 'country', 'regime'] as const;

@Component({
  selector: 'fl-site-list',
  imports: [
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatButtonModule,
    MatIconModule,
    FilterField,
    PageHeader,
  ],
  templateUrl: './site-list.html',
  styleUrl: './site-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class SiteList {
  private readonly api = inject(SitesApi);
  private readonly auth = inject(Auth);

  protected readonly canEdit = canEditSetup();
  protected readonly isManager = computed(() => this.auth.me()?.role === 'manager');
  protected readonly columns = ['name', 'country', 'regime', 'timeZone'];
  protected readonly pageSizeOptions = [10, 25, 50];

  protected readonly filter = signal('');
  protected readonly sort = signal<Sort>({ active: 'name', direction: 'asc' });
  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(25);
  protected readonly status = signal<'loading' | 'loaded' | 'failed'>('loading');
  protected readonly sites = signal<Site[]>([]);
  protected readonly total = signal(0);

  private readonly query = computed<ListQuery>(() => {
    const sort = this.sort();
    const sortable = (sortableColumns as readonly string[]).includes(sort.active) && sort.direction;
    return {
      limit: this.pageSize(),
      offset: this.pageIndex() * this.pageSize(),
      q: this.filter().trim() || undefined,
      sort: sortable ? sort.active : undefined,
      order: sortable ? (sort.direction as 'asc' | 'desc') : undefined,
    };
  });

  constructor() {
    toObservable(this.query)
      .pipe(
        // Typing in the filter sends one request once the person pauses, not one per key.
        debounceTime(200),
        distinctUntilChanged((a, b) => JSON.stringify(a) === JSON.stringify(b)),
        tap(() => this.status.set('loading')),
        switchMap((query) =>
          this.api.listSites(query).pipe(
            map((page) => ({ page })),
            catchError(() => of({ page: null })),
          ),
        ),
        takeUntilDestroyed(),
      )
      .subscribe(({ page }) => {
        if (!page) {
          this.status.set('failed');
          return;
        }
        this.sites.set(page.items);
        this.total.set(page.total);
        this.status.set('loaded');
      });
  }

  protected onFilter(text: string): void {
    this.pageIndex.set(0);
    this.filter.set(text);
  }

  protected onSort(sort: Sort): void {
    this.pageIndex.set(0);
    this.sort.set(sort);
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected regimeLabel(site: Site): string {
    return regimeLabels[site.regime];
  }

  protected countryName(code: string): string {
    try {
      return new Intl.DisplayNames(['en'], { type: 'region' }).of(code) ?? code;
    } catch {
      return code;
    }
  }
}
