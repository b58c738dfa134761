import { ChangeDetectionStrategy, Component, computed, effect, inject, input, signal } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router } from '@angular/router';
import { firstValueFrom } from 'rxjs';

import { Channel, SiteDetail, SitesApi, StackInput, StackWithChannels } from '../../../core/api/sites-api';
import { ClientTable } from '../../../shared/client-table';
import { ConflictNotice } from '../../../shared/conflict-notice';
import { FilterField } from '../../../shared/filter-field';
import { FormActions } from '../../../shared/form-actions';
import { classifySaveError, fieldError } from '../../../shared/form-errors';
import { LoadState } from '../../../shared/load-state';
import { namesOf } from '../../../shared/names-of';
import { PageHeader } from '../../../shared/page-header';
import { ReadOnlyField, ReadOnlyFields } from '../../../shared/read-only-fields';
import { RecordEditor } from '../../../shared/record-editor';
import { RowActions } from '../../../shared/row-actions';
import { analyserRangeLabel, basisLabels, conditionsLabels, parameterLabels, unitLabel } from '../../../shared/setup-labels';
import { TablePager } from '../../../shared/table-pager';
import { upsertById } from '../../../shared/upsert-by-id';
import { HasUnsavedChanges, warnBeforeUnload } from '../../../shared/unsaved-changes';
import { ChannelDialog, ChannelDialogData } from '../channel-dialog/channel-dialog';

export interface ChannelTableRow {
  channel: Channel;
  parameter: string;
  unit: string;
  basis: string;
  conditions: string;
  range: string;
  intervalMinutes: number;
  sourceLabel: string;
}

/**
 * A stack (its name, size and the units exhausting through it) and the table of channels its
 * monitors report. Channels can be added once the stack is saved.
 */
@Component({
  selector: 'fl-stack-editor',
  imports: [
    ReactiveFormsModule,
    MatFormFieldModule,
    MatInputModule,
    MatSelectModule,
    MatButtonModule,
    MatIconModule,
    MatTableModule,
    MatSortModule,
    ConflictNotice,
    FilterField,
    FormActions,
    LoadState,
    PageHeader,
    ReadOnlyFields,
    RowActions,
    TablePager,
  ],
  providers: [RecordEditor],
  templateUrl: './stack-editor.html',
  styleUrl: './stack-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: { '(window:beforeunload)': 'onBeforeUnload($event)' },
})
export class StackEditor implements HasUnsavedChanges {
  private readonly api = inject(SitesApi);
  private readonly router = inject(Router);
  private readonly dialog = inject(MatDialog);
  protected readonly editor = inject(RecordEditor);
  private readonly fb = inject(NonNullableFormBuilder);

  readonly siteId = input.required<string>();
  /** Absent on …/stacks/new. */
  readonly stackId = input<string>();

  protected readonly fieldError = fieldError;

  protected readonly form = this.fb.group({
    name: this.fb.control('', [Validators.required, Validators.maxLength(200)]),
    heightM: this.fb.control<number | null>(null, [Validators.min(0.01), Validators.max(1000)]),
    diameterM: this.fb.control<number | null>(null, [Validators.min(0.01), Validators.max(100)]),
    unitIds: this.fb.control<string[]>([]),
  });

  protected readonly site = signal<SiteDetail | null>(null);
  protected readonly stack = signal<StackWithChannels | null>(null);
  protected readonly filter = signal('');

  protected readonly readOnlyFields = computed<ReadOnlyField[]>(() => {
    const stack = this.stack();
    if (!stack) return [];
    return [
      { label: 'Height', value: stack.heightM === null ? '' : `${stack.heightM} m` },
      { label: 'Diameter', value: stack.diameterM === null ? '' : `${stack.diameterM} m` },
      { label: 'Emission units', value: namesOf(stack.unitIds, this.site()?.units ?? []) },
    ];
  });

  private readonly channelRows = computed<ChannelTableRow[]>(() =>
    (this.stack()?.channels ?? []).map((channel) => ({
      channel,
      parameter: parameterLabels[channel.parameter],
      unit: unitLabel(channel.unit),
      basis: basisLabels[channel.basis],
      conditions: conditionsLabels[channel.conditions],
      range: analyserRangeLabel(channel),
      intervalMinutes: channel.intervalMinutes,
      sourceLabel: channel.sourceLabel ?? '',
    })),
  );

  protected readonly channels = new ClientTable<ChannelTableRow>({
    rows: this.channelRows,
    filter: this.filter,
    text: (row) => [row.parameter, row.unit, row.basis, row.conditions, row.sourceLabel].join(' '),
    sortValue: (row, column) => (row as unknown as Record<string, string | number>)[column] ?? null,
    initialSort: { active: 'parameter', direction: 'asc' },
  });

  protected readonly channelColumns = computed(() => {
    const columns = ['parameter', 'unit', 'basis', 'conditions', 'range', 'intervalMinutes', 'sourceLabel'];
    return this.editor.canEdit() ? [...columns, 'actions'] : columns;
  });

  constructor() {
    effect(() => void this.load(this.siteId(), this.stackId()));
  }

  hasUnsavedChanges(): boolean {
    return this.editor.hasUnsavedChanges(this.form);
  }

  protected onBeforeUnload(event: BeforeUnloadEvent): void {
    warnBeforeUnload(event, this.hasUnsavedChanges());
  }

  protected reload(): Promise<void> {
    return this.load(this.siteId(), this.stackId());
  }

  private load(siteId: string, stackId: string | undefined): Promise<void> {
    return this.editor.load(async () => {
      const [site, stack] = await Promise.all([
        firstValueFrom(this.api.getSite(siteId)),
        stackId ? firstValueFrom(this.api.getStack(stackId)) : Promise.resolve(null),
      ]);
      this.site.set(site);
      this.stack.set(stack);
      if (stack) {
        this.form.reset({ name: stack.name, heightM: stack.heightM, diameterM: stack.diameterM, unitIds: stack.unitIds });
      }
    });
  }

  protected save(): Promise<void> {
    return this.editor.save(this.form, async () => {
      const value = this.form.getRawValue();
      const body: StackInput = { ...value, name: value.name.trim() };
      const current = this.stack();
      if (current) {
        const saved = await firstValueFrom(this.api.updateStack(current.id, { ...body, version: current.version }));
        this.stack.set({ ...current, ...saved });
        this.form.markAsPristine();
        this.editor.notify('Stack saved.');
      } else {
        const created = await firstValueFrom(this.api.createStack(this.siteId(), body));
        this.form.markAsPristine();
        this.editor.notify(`Stack “${created.name}” added. Now add the channels its monitors report.`, 6000);
        // Channels belong to a saved stack: continue on the stack's own page.
        await this.router.navigate(['/sites', this.siteId(), 'stacks', created.id], { replaceUrl: true });
      }
    });
  }

  protected async archive(): Promise<void> {
    const stack = this.stack();
    if (!stack) return;
    const message = `Stack “${stack.name}” archived. Its readings and history are kept.`;
    await this.editor.archive(this.api.archiveStack(stack.id, stack.version), this.form, message, this.siteId());
  }

  protected async openChannel(channel?: Channel): Promise<void> {
    const stack = this.stack();
    if (!stack) return;
    const ref = this.dialog.open<ChannelDialog, ChannelDialogData, Channel>(ChannelDialog, {
      data: { stackId: stack.id, channel },
      width: '720px',
      maxWidth: '95vw',
    });
    const saved = await firstValueFrom(ref.afterClosed());
    if (!saved) {
      // Closed without a channel: cancelled, or the dialog found the channel changed meanwhile.
      if (channel) await this.refreshChannels();
      return;
    }
    this.stack.update((current) => (current ? { ...current, channels: upsertById(current.channels, saved) } : current));
    this.editor.notify(`${parameterLabels[saved.parameter]} channel saved.`, 4000);
  }

  protected async archiveChannel(channel: Channel): Promise<void> {
    try {
      await firstValueFrom(this.api.archiveChannel(channel.id, channel.version));
      this.stack.update((current) =>
        current ? { ...current, channels: current.channels.filter((existing) => existing.id !== channel.id) } : current,
      );
      this.editor.notify(`${parameterLabels[channel.parameter]} channel archived. Its readings are kept.`);
    } catch (error) {
      if (classifySaveError(error) === 'stale') await this.refreshChannels();
    }
  }

  private async refreshChannels(): Promise<void> {
    const stack = this.stack();
    if (!stack) return;
    const fresh = await firstValueFrom(this.api.getStack(stack.id));
    this.stack.update((current) => (current ? { ...current, channels: fresh.channels } : current));
  }

  protected onFilter(text: string): void {
    this.channels.pageIndex.set(0);
    this.filter.set(text);
  }

  protected channelName(channel: Channel): string {
    return `${parameterLabels[channel.parameter]} ${basisLabels[channel.basis].toLowerCase()}`;
  }
}
