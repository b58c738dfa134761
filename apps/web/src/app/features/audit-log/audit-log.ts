import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatTableModule } from '@angular/material/table';
import { catchError, map, of, switchMap, tap } from 'rxjs';

import { AuditEntry, AuditLogApi, AuditLogQuery } from '../../core/api/audit-log-api';
import { actionLabel, entityLabel } from './action-label';
import { describeChanges } from './changes';

type AuditRow = AuditEntry & { changes: ReturnType<typeof describeChanges>; actionText: string; entityText: string };

@Component({
  selector: 'fl-audit-log',
  imports: [
    DatePipe,
    MatTableModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
  ],
  templateUrl: './audit-log.html',
  styleUrl: './audit-log.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AuditLog {
  private readonly api = inject(AuditLogApi);

  protected readonly columns = ['at', 'actor', 'action', 'entity', 'changes'];
  protected readonly pageSizeOptions = [10, 25, 50, 100];

  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(25);
  /** The entity filter in force (applied on submit, not on every keystroke). */
  protected readonly entity = signal('');
  protected readonly status = signal<'loading' | 'loaded' | 'failed'>('loading');
  protected readonly rows = signal<AuditRow[]>([]);
  protected readonly total = signal(0);

  private readonly query = computed<AuditLogQuery>(() => ({
    limit: this.pageSize(),
    offset: this.pageIndex() * this.pageSize(),
    entity: this.entity() || undefined,
  }));

  constructor() {
    toObservable(this.query)
      .pipe(
        tap(() => this.status.set('loading')),
        // switchMap drops the answer to an older query when the person pages on quickly.
        switchMap((query) =>
          this.api.list(query).pipe(
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
        this.rows.set(page.items.map((entry) => ({
          ...entry,
          changes: describeChanges(entry.before, entry.after),
          actionText: actionLabel(entry.action),
          entityText: entityLabel(entry.entity),
        })));
        this.total.set(page.total);
        this.status.set('loaded');
      });
  }

  protected applyEntity(value: string): void {
    this.pageIndex.set(0);
    this.entity.set(value.trim());
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }
}
