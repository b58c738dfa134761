import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatRadioModule } from '@angular/material/radio';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import { startWith } from 'rxjs';

import { CorrectionAction, CorrectionBody, RawReading, ReviewApi, ReviewChannel } from '../../../core/api/review-api';
import { channelLabel } from '../../../shared/channel-label';
import { fieldError } from '../../../shared/form-errors';
import { formatNumber } from '../../../shared/format-number';
import { unitLabel } from '../../../shared/setup-labels';
import { formatZoned } from '../../../shared/time/zoned-time';
import { statusLabel } from '../hourly-table/hourly-table';

const hourMs = 3_600_000;

/**
 * The raw readings behind one hourly value and the imports that brought them, superseded ones
 * included. People with `data:correct` may mark the hour's readings invalid or substitute a value,
 * always with a reason; the originals stay on record.
 */
@Component({
  selector: 'fl-readings-panel',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatRadioModule, MatTableModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  templateUrl: './readings-panel.html',
  styleUrl: './readings-panel.scss',
})
export class ReadingsPanel {
  private readonly api = inject(ReviewApi);
  private readonly snackBar = inject(MatSnackBar);

  readonly channel = input.required<ReviewChannel>();
  readonly hourStart = input.required<string>();
  readonly timeZone = input<string | null>(null);
  /** Whether correction controls are shown at all; the API checks `data:correct` again. */
  readonly canCorrect = input(false);
  readonly corrected = output<void>();
  readonly closed = output<void>();

  protected readonly formatZoned = formatZoned;
  protected readonly formatNumber = formatNumber;
  protected readonly statusLabel = statusLabel;
  protected readonly fieldError = fieldError;
  protected readonly unitLabel = unitLabel;
  protected readonly channelLabel = channelLabel;
  protected readonly columns = ['t', 'value', 'status', 'import', 'superseded'];

  protected readonly readings = signal<RawReading[]>([]);
  private readonly importNames = signal(new Map<string, string>());
  protected readonly truncated = signal(false);
  protected readonly status = signal<'loading' | 'loaded' | 'failed'>('loading');
  private readonly reload = signal(0);
  protected readonly saving = signal(false);

  /** By id: a reloaded review hands over a new but equal channel object, which must not fetch again. */
  private readonly channelId = computed(() => this.channel().id);
  private readonly hourEnd = computed(() => new Date(Date.parse(this.hourStart()) + hourMs).toISOString());

  protected readonly form = inject(NonNullableFormBuilder).group({
    action: ['invalidate' as CorrectionAction],
    value: [''],
    reason: ['', [Validators.required, Validators.maxLength(2000)]],
  });
  private readonly formValue = toSignal(this.form.valueChanges.pipe(startWith(this.form.getRawValue())), { initialValue: this.form.getRawValue() });
  protected readonly substituting = computed(() => this.formValue().action === 'substitute');

  constructor() {
    effect((onCleanup) => {
      const channelId = this.channelId();
      const from = new Date(Date.parse(this.hourStart())).toISOString();
      const to = this.hourEnd();
      this.reload();
      this.status.set('loading');
      const subscription = this.api.readings(channelId, { from, to, includeSuperseded: true }).subscribe({
        next: (answer) => {
          this.readings.set(answer.items);
          this.importNames.set(new Map(answer.imports.map((entry) => [entry.id, entry.fileName])));
          this.truncated.set(answer.truncated);
          this.status.set('loaded');
        },
        error: () => this.status.set('failed'),
      });
      onCleanup(() => subscription.unsubscribe());
    });
  }

  protected importText(reading: RawReading): string {
    if (!reading.importId) return 'Correction';
    return this.importNames().get(reading.importId) ?? `Import ${reading.importId.slice(0, 8)}`;
  }

  /** Who wrote the reading into the record, and when (a correction's author, an import's committer). */
  protected writtenText(reading: RawReading): string {
    const when = formatZoned(reading.createdAt, this.timeZone());
    return reading.createdByName ? `by ${reading.createdByName}, ${when}` : when;
  }

  protected apply(): void {
    if (this.saving()) return;
    const { action, value, reason } = this.form.getRawValue();
    if (reason.trim().length < 3) {
      this.form.controls.reason.setErrors({ message: 'Say why, in a few words' });
      this.form.controls.reason.markAsTouched();
      return;
    }
    const body: CorrectionBody = { from: new Date(Date.parse(this.hourStart())).toISOString(), to: this.hourEnd(), action, reason: reason.trim() };
    if (action === 'substitute') {
      const number = Number(value.replace(',', '.'));
      if (value.trim() === '' || !Number.isFinite(number)) {
        this.form.controls.value.setErrors({ message: 'Enter the value each reading takes' });
        this.form.controls.value.markAsTouched();
        return;
      }
      body.valuePerReading = number;
    }
    this.saving.set(true);
    this.api.correct(this.channelId(), body).subscribe({
      next: () => {
        this.saving.set(false);
        this.form.reset();
        this.snackBar.open('Correction recorded. Hourly values are recalculated.', 'Close', { duration: 6000 });
        this.reload.update((n) => n + 1);
        this.corrected.emit();
      },
      // The error interceptor shows the API's message.
      error: () => this.saving.set(false),
    });
  }
}
