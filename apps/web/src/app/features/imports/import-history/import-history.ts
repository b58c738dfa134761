import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginatorModule, PageEvent } from '@angular/material/paginator';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';

import { ImportState, ImportSummary, ImportsApi } from '../../../core/api/imports-api';
import { Auth } from '../../../core/auth/auth';
import { formatNumber } from '../../../shared/format-number';
import { formatZoned } from '../../../shared/time/zoned-time';
import { RollbackDialog, RollbackDialogData } from './rollback-dialog';

export const importStateLabels: Record<ImportState, string> = {
  parsed: 'Uploaded, not mapped',
  mapped: 'Mapped, not committed',
  committing: 'Committing',
  committed: 'Committed',
  rolled_back: 'Rolled back',
  failed: 'Failed',
};

/** The stack's imports, newest first; a committed one can be rolled back as a whole, with a reason. */
@Component({
  selector: 'fl-import-history',
  imports: [DecimalPipe, MatButtonModule, MatIconModule, MatPaginatorModule, MatTableModule],
  templateUrl: './import-history.html',
  styleUrl: './import-history.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ImportHistory {
  private readonly api = inject(ImportsApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly auth = inject(Auth);

  readonly stackId = input.required<string>();
  readonly timeZone = input<string | null>(null);
  /** Bumped by the page after a commit, so the list shows it. */
  readonly reloadKey = input(0);
  readonly resume = output<ImportSummary>();
  readonly rolledBack = output<void>();

  protected readonly canImport = computed(() => this.auth.can('data:import'));
  protected readonly columns = ['uploadedAt', 'file', 'span', 'counts', 'state', 'actions'];
  protected readonly formatZoned = formatZoned;
  protected readonly formatNumber = formatNumber;

  protected readonly pageIndex = signal(0);
  protected readonly pageSize = signal(10);
  private readonly localReload = signal(0);
  protected readonly rows = signal<ImportSummary[]>([]);
  protected readonly total = signal(0);
  protected readonly status = signal<'loading' | 'loaded' | 'failed'>('loading');

  constructor() {
    effect((onCleanup) => {
      const stackId = this.stackId();
      const size = this.pageSize();
      const offset = this.pageIndex() * size;
      this.reloadKey();
      this.localReload();
      this.status.set('loading');
      const subscription = this.api.list(stackId, size, offset).subscribe({
        next: (page) => {
          this.rows.set(page.items);
          this.total.set(page.total);
          this.status.set('loaded');
        },
        error: () => this.status.set('failed'),
      });
      onCleanup(() => subscription.unsubscribe());
    });
  }

  protected stateLabel(state: string): string {
    return (importStateLabels as Record<string, string>)[state] ?? state;
  }

  protected onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }

  protected rollback(entry: ImportSummary): void {
    this.dialog
      .open<RollbackDialog, RollbackDialogData, string>(RollbackDialog, { data: { fileName: entry.fileName } })
      .afterClosed()
      .subscribe((reason) => {
        if (!reason) return;
        this.api.rollback(entry.id, reason).subscribe(() => {
          this.snackBar.open(`${entry.fileName} was rolled back.`, 'Close', { duration: 6000 });
          this.localReload.update((n) => n + 1);
          this.rolledBack.emit();
        });
      });
  }
}
