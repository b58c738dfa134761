import { DecimalPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatPaginatorModule } from '@angular/material/paginator';
import { MatTableModule } from '@angular/material/table';

import { CommitResult, ImportPreview, ImportsApi } from '../../../core/api/imports-api';
import type { Channel } from '../../../core/api/sites-api';
import { channelLabel } from '../../../shared/channel-label';
import { ClientTable } from '../../../shared/client-table';
import { formatNumber } from '../../../shared/format-number';
import { formatZoned } from '../../../shared/time/zoned-time';
import { CommitPanel } from '../commit-panel/commit-panel';

/**
 * Step 3: what the file would bring, before anything is stored — sample rows, every problem, totals
 * per channel, the time span, gaps, duplicates and how it overlaps data already stored.
 */
@Component({
  selector: 'fl-preview-step',
  imports: [DecimalPipe, MatButtonModule, MatIconModule, MatPaginatorModule, MatTableModule, CommitPanel],
  templateUrl: './preview-step.html',
  styleUrl: './preview-step.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class PreviewStep {
  private readonly api = inject(ImportsApi);

  readonly importId = input.required<string>();
  readonly channels = input.required<readonly Channel[]>();
  readonly timeZone = input<string | null>(null);
  /** False for people who may read the preview but not commit it. */
  readonly canCommit = input(true);
  readonly committed = output<CommitResult>();
  readonly backToMapping = output<void>();

  protected readonly preview = signal<ImportPreview | null>(null);
  protected readonly status = signal<'loading' | 'loaded' | 'failed'>('loading');
  protected readonly formatZoned = formatZoned;
  protected readonly formatNumber = formatNumber;

  private readonly channelsById = computed(() => new Map(this.channels().map((channel) => [channel.id, channel])));
  /** The channels the sample shows, in the file's column order. */
  protected readonly sampleChannels = computed(() =>
    (this.preview()?.perChannel ?? [])
      .slice()
      .sort((a, b) => a.columnIndex - b.columnIndex)
      .map((totals) => ({ id: totals.channelId, label: this.label(totals.channelId) })),
  );
  protected readonly sampleColumns = computed(() => ['row', 't', 'status', ...this.sampleChannels().map((c) => c.id)]);
  protected readonly totalsColumns = ['channel', 'count', 'valid', 'invalid', 'min', 'mean', 'max'];
  protected readonly problemColumns = ['row', 'column', 'value', 'reason'];

  protected readonly problems = new ClientTable({
    rows: computed(() => this.preview()?.problems ?? []),
    filter: signal(''),
    text: (problem) => `${problem.row} ${problem.column} ${problem.value} ${problem.reason}`,
    sortValue: (problem, column) => (column === 'row' ? problem.row : String(problem[column as 'column' | 'value' | 'reason'])),
    pageSize: 10,
  });

  constructor() {
    effect((onCleanup) => {
      const importId = this.importId();
      this.status.set('loading');
      const subscription = this.api.preview(importId).subscribe({
        next: (preview) => {
          this.preview.set(preview);
          this.status.set('loaded');
        },
        error: () => this.status.set('failed'),
      });
      onCleanup(() => subscription.unsubscribe());
    });
  }

  protected label(channelId: string): string {
    const channel = this.channelsById().get(channelId);
    return channel ? channelLabel(channel) : 'Unknown channel';
  }

  protected problemsWorkbookUrl(): string {
    return this.api.problemsWorkbookUrl(this.importId());
  }

  protected intervalText(seconds: number | null): string {
    if (!seconds) return 'Not regular';
    return seconds % 60 === 0 ? `${seconds / 60} min` : `${seconds} s`;
  }
}
