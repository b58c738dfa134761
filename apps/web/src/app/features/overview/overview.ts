import { ChangeDetectionStrategy, Component, computed, effect, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCardModule } from '@angular/material/card';
import { MatIconModule } from '@angular/material/icon';
import { RouterLink } from '@angular/router';
import { catchError, forkJoin, map, of, switchMap } from 'rxjs';

import { ImportSummary, ImportsApi } from '../../core/api/imports-api';
import { SiteDetail, SitesApi, Stack } from '../../core/api/sites-api';
import { Auth } from '../../core/auth/auth';
import { describePermission, roleLabels, roleSummaries } from '../../core/auth/roles';
import { formatZoned, formatZonedDate } from '../../shared/time/zoned-time';

/** A stack on the overview, with the newest import that brought data in (none yet: null). */
export interface StackStart {
  stack: Stack;
  latestImport: ImportSummary | null;
}

export interface SiteStart {
  site: SiteDetail;
  stacks: StackStart[];
}

/** More sites than this and the overview points to the site list instead of loading them all. */
const sitesShown = 5;

/**
 * Home after sign-in: where you are, who you are here, and the next useful step for your role —
 * your sites and their stacks, with the data each holds and where to review or import it.
 * Only records that exist are linked: a stack without data offers an import to those who may.
 */
@Component({
  selector: 'fl-overview',
  imports: [MatButtonModule, MatCardModule, MatIconModule, RouterLink],
  templateUrl: './overview.html',
  styleUrl: './overview.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class Overview {
  private readonly auth = inject(Auth);
  private readonly sitesApi = inject(SitesApi);
  private readonly importsApi = inject(ImportsApi);

  protected readonly me = this.auth.me;
  protected readonly roleLabel = computed(() => {
    const me = this.me();
    return me ? roleLabels[me.role] : '';
  });
  protected readonly roleSummary = computed(() => {
    const me = this.me();
    return me ? roleSummaries[me.role] : '';
  });
  protected readonly abilities = computed(() =>
    [...(this.me()?.permissions ?? [])].sort().map((permission) => ({
      permission,
      text: describePermission(permission),
    })),
  );

  private readonly permissions = computed(() => new Set(this.me()?.permissions ?? []));
  protected readonly canReadSites = computed(() => this.permissions().has('site:read'));
  protected readonly canReadData = computed(() => this.permissions().has('data:read'));
  protected readonly canImport = computed(() => this.permissions().has('data:import'));
  protected readonly canSetUp = computed(() => this.permissions().has('site:write'));
  protected readonly canReadAudit = computed(() => this.permissions().has('audit:read'));
  protected readonly canManageMembers = computed(() => this.permissions().has('members:manage'));

  protected readonly sites = signal<SiteStart[]>([]);
  protected readonly siteTotal = signal(0);
  protected readonly status = signal<'idle' | 'loading' | 'loaded' | 'failed'>('idle');

  /** The newest committed import among the stacks shown: where an officer picks up. */
  protected readonly latestImport = computed(() => {
    let latest: { entry: StackStart; site: SiteDetail } | null = null;
    for (const { site, stacks } of this.sites()) {
      for (const entry of stacks) {
        const committedAt = entry.latestImport?.committedAt;
        if (committedAt && (!latest || committedAt > (latest.entry.latestImport?.committedAt ?? ''))) latest = { entry, site };
      }
    }
    return latest;
  });

  protected readonly formatZoned = formatZoned;
  protected readonly formatZonedDate = formatZonedDate;

  /** The last instant an import's data covers: its span ends where the last interval ends (exclusive). */
  protected dataEnd(imported: { span?: { to: string } | null; committedAt: string | null }): number | string | null {
    return imported.span ? Date.parse(imported.span.to) - 1 : imported.committedAt;
  }

  constructor() {
    effect((onCleanup) => {
      const organisationId = this.me()?.organisation.id;
      if (!organisationId || !this.canReadSites()) {
        this.sites.set([]);
        this.status.set('idle');
        return;
      }
      const readData = this.canReadData();
      this.status.set('loading');
      const subscription = this.sitesApi
        .listSites({ limit: sitesShown })
        .pipe(
          switchMap((page) => {
            this.siteTotal.set(page.total);
            if (!page.items.length) return of([] as SiteStart[]);
            return forkJoin(page.items.map((site) => this.sitesApi.getSite(site.id).pipe(switchMap((detail) => this.withImports(detail, readData)))));
          }),
        )
        .subscribe({
          next: (sites) => {
            this.sites.set(sites);
            this.status.set('loaded');
          },
          error: () => this.status.set('failed'),
        });
      onCleanup(() => subscription.unsubscribe());
    });
  }

  /** The site's stacks, each with its newest committed import (people without `data:read` see none). */
  private withImports(site: SiteDetail, readData: boolean) {
    const stacks = site.stacks.filter((stack) => !stack.archivedAt);
    if (!readData || !stacks.length) return of({ site, stacks: stacks.map((stack) => ({ stack, latestImport: null })) });
    return forkJoin(
      stacks.map((stack) =>
        this.importsApi.list(stack.id, 5, 0).pipe(
          map((page) => ({ stack, latestImport: page.items.find((entry) => entry.state === 'committed') ?? null })),
          // One stack's history failing to load must not hide the others.
          catchError(() => of({ stack, latestImport: null })),
        ),
      ),
    ).pipe(map((entries) => ({ site, stacks: entries })));
  }
}
