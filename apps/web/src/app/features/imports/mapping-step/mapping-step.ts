import { DecimalPipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, OnInit, computed, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { AbstractControl, FormArray, FormControl, NonNullableFormBuilder, ReactiveFormsModule, ValidationErrors } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { Subscription, startWith } from 'rxjs';

import { apiErrorMessage, handledByCaller } from '../../../core/api/api-error';
import { ImportColumn, ImportDraft, ImportProgress, ImportsApi, IntervalConvention, MappingBody } from '../../../core/api/imports-api';
import type { Channel } from '../../../core/api/sites-api';
import { channelLabel } from '../../../shared/channel-label';
import { formatNumber } from '../../../shared/format-number';
import { formatZoned } from '../../../shared/time/zoned-time';
import { PROGRESS_POLL_INTERVAL_MS, progressPercent, progressText, withProgressPolling } from '../progress-polling';

interface MappingRow {
  position: number;
  column: ImportColumn;
}

/** The server's reasons for a suggestion (`suggestMapping` in the API's imports module). */
const suggestionSources: Record<string, string> = {
  stack_map: 'as remembered for this stack',
  source_label: "the channel's logger label",
  header: 'from the header and unit',
};

/** A column the timestamp or status select offers. */
interface LayoutColumn {
  index: number;
  letter: string;
  header: string;
}

/** Spreadsheet column letters, as the API writes them: 0 → A, 25 → Z, 26 → AA. */
function columnLetter(index: number): string {
  let letters = '';
  for (let n = index + 1; n > 0; n = Math.floor((n - 1) / 26)) letters = String.fromCharCode(65 + ((n - 1) % 26)) + letters;
  return letters;
}

/** Each channel may take one column: two columns into one channel would double its readings. */
function noChannelTwice(control: AbstractControl): ValidationErrors | null {
  const chosen = (control as FormArray<FormControl<string | null>>).getRawValue().filter((id): id is string => !!id);
  return new Set(chosen).size === chosen.length ? null : { channelTwice: true };
}

/**
 * Step 2: the columns of the file with the suggested channel for each; the officer confirms or
 * changes them, and may keep the map for the stack so next month's file maps itself.
 */
@Component({
  selector: 'fl-mapping-step',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatProgressBarModule,
    MatSelectModule,
    MatTableModule,
  ],
  templateUrl: './mapping-step.html',
  styleUrl: './mapping-step.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MappingStep implements OnInit {
  private readonly api = inject(ImportsApi);
  private readonly fb = inject(NonNullableFormBuilder);
  private readonly pollIntervalMs = inject(PROGRESS_POLL_INTERVAL_MS);
  private readonly destroyRef = inject(DestroyRef);

  readonly draft = input.required<ImportDraft>();
  readonly channels = input.required<readonly Channel[]>();
  readonly timeZone = input<string | null>(null);
  readonly mapped = output<ImportDraft>();

  protected readonly form = this.fb.group({
    timestampColumn: this.fb.control(0),
    statusColumn: new FormControl<number | null>(null),
    intervalConvention: this.fb.control<IntervalConvention>('interval_end'),
    saveAsStackMap: this.fb.control(true),
    columns: new FormArray<FormControl<string | null>>([], { validators: noChannelTwice }),
  });

  protected readonly displayedColumns = ['column', 'unit', 'sample', 'suggested', 'channel'];
  protected readonly rows = computed<MappingRow[]>(() => this.draft().columns.map((column, position) => ({ position, column })));
  /**
   * The columns the timestamp and status selects offer. The draft's `columns` are the value
   * columns only: the timestamp column and the status column the server found are not among
   * them, so they are added here, or their selects would show nothing chosen.
   */
  protected readonly layoutColumns = computed<LayoutColumn[]>(() => {
    const draft = this.draft();
    const byIndex = new Map<number, LayoutColumn>(draft.columns.map((c) => [c.index, { index: c.index, letter: c.letter, header: c.header }]));
    if (!byIndex.has(draft.timestampColumn)) {
      byIndex.set(draft.timestampColumn, { index: draft.timestampColumn, letter: columnLetter(draft.timestampColumn), header: draft.timestampHeader });
    }
    if (draft.statusColumn !== null && !byIndex.has(draft.statusColumn)) {
      byIndex.set(draft.statusColumn, { index: draft.statusColumn, letter: columnLetter(draft.statusColumn), header: '(status)' });
    }
    return [...byIndex.values()].sort((a, b) => a.index - b.index);
  });
  protected readonly channelsById = computed(() => new Map(this.channels().map((channel) => [channel.id, channel])));

  private readonly formValue = toSignal(this.form.valueChanges.pipe(startWith(null)), { initialValue: null });
  protected readonly timestampColumn = computed(() => (this.formValue(), this.form.controls.timestampColumn.value));
  protected readonly statusColumn = computed(() => (this.formValue(), this.form.controls.statusColumn.value));
  protected readonly mappedCount = computed(() => {
    this.formValue();
    return this.mappableControls().filter((control) => !!control.value).length;
  });
  protected readonly channelTwice = computed(() => (this.formValue(), this.form.controls.columns.hasError('channelTwice')));

  protected readonly saving = signal(false);
  protected readonly progress = signal<ImportProgress | null>(null);
  protected readonly progressPercent = computed(() => progressPercent(this.progress()));
  protected readonly error = signal<string | null>(null);
  protected readonly progressText = computed(() => progressText(this.progress()));
  protected readonly formatZoned = formatZoned;
  private running: Subscription | null = null;

  constructor() {
    this.destroyRef.onDestroy(() => this.running?.unsubscribe());
  }

  ngOnInit(): void {
    const draft = this.draft();
    const known = this.channelsById();
    this.form.controls.columns.clear({ emitEvent: false });
    for (const column of draft.columns) {
      // The confirmed choice of an earlier visit wins; otherwise the suggestion, if it names a live channel.
      const initial = column.mappedChannelId ?? column.suggestedChannelId;
      this.form.controls.columns.push(new FormControl<string | null>(initial && known.has(initial) ? initial : null), { emitEvent: false });
    }
    this.form.patchValue({
      timestampColumn: draft.timestampColumn,
      statusColumn: draft.statusColumn,
      intervalConvention: draft.intervalConvention,
    });
  }

  protected channelLabel = channelLabel;

  protected columnControl(position: number): FormControl<string | null> {
    return this.form.controls.columns.at(position);
  }

  protected isSpecial(column: ImportColumn): boolean {
    return column.index === this.timestampColumn() || column.index === this.statusColumn();
  }

  /** Why a channel was suggested, in words; a reason this screen does not know is shown as sent. */
  protected suggestionSourceText(source: string): string {
    return suggestionSources[source] ?? source;
  }

  protected suggestionText(column: ImportColumn): string {
    if (!column.suggestedChannelId) return 'No suggestion';
    const channel = this.channelsById().get(column.suggestedChannelId);
    return channel ? channelLabel(channel) : 'A channel no longer on this stack';
  }

  protected sampleText(column: ImportColumn): string {
    const values = column.sample.slice(0, 4).map((value) => formatNumber(value));
    return values.length ? values.join(', ') : '—';
  }

  protected confirm(): void {
    if (this.saving()) return;
    if (this.mappedCount() === 0) {
      this.error.set('Choose a channel for at least one column.');
      return;
    }
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      this.error.set('A channel is chosen for more than one column. Each channel may take one column.');
      return;
    }
    const value = this.form.getRawValue();
    const draft = this.draft();
    const body: MappingBody = {
      columns: draft.columns
        .map((column, position) => ({ index: column.index, channelId: this.isSpecial(column) ? null : value.columns[position] }))
        .filter((entry) => entry.index !== value.timestampColumn),
      timestampColumn: value.timestampColumn,
      statusColumn: value.statusColumn,
      intervalConvention: value.intervalConvention,
      saveAsStackMap: value.saveAsStackMap,
    };
    this.error.set(null);
    this.progress.set(null);
    this.saving.set(true);
    this.running = withProgressPolling(
      this.api.saveMapping(draft.id, body),
      () => this.api.progress(draft.id, handledByCaller()),
      (progress) => this.progress.set(progress),
      this.pollIntervalMs,
    ).subscribe({
      next: (updated) => {
        this.saving.set(false);
        this.mapped.emit(updated);
      },
      error: (error: unknown) => {
        this.saving.set(false);
        this.error.set(error instanceof HttpErrorResponse ? apiErrorMessage(error) : 'The mapping could not be saved.');
      },
    });
  }

  private mappableControls(): FormControl<string | null>[] {
    const draft = this.draft();
    return draft.columns
      .map((column, position) => ({ column, control: this.form.controls.columns.at(position) }))
      .filter(({ column, control }) => control && !this.isSpecial(column))
      .map(({ control }) => control);
  }
}
