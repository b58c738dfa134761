import { DecimalPipe } from '@angular/common';
import { HttpErrorResponse } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, output, signal } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Subscription, startWith } from 'rxjs';

import { apiErrorCode, apiErrorMessage, handledByCaller } from '../../../core/api/api-error';
import { CommitBody, CommitResult, ImportProgress, ImportsApi } from '../../../core/api/imports-api';
import { fieldError } from '../../../shared/form-errors';
import { PROGRESS_POLL_INTERVAL_MS, progressPercent, progressText, withProgressPolling } from '../progress-polling';

/**
 * Commits a previewed import in one transaction, with the server's progress. Stored values that
 * differ from the file are kept unless the officer explicitly chooses to replace them and says
 * why (the replaced readings stay on record, superseded).
 */
@Component({
  selector: 'fl-commit-panel',
  imports: [
    DecimalPipe,
    ReactiveFormsModule,
    MatButtonModule,
    MatCheckboxModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
  ],
  templateUrl: './commit-panel.html',
  styleUrl: './commit-panel.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class CommitPanel {
  private readonly api = inject(ImportsApi);
  private readonly pollIntervalMs = inject(PROGRESS_POLL_INTERVAL_MS);
  private readonly destroyRef = inject(DestroyRef);

  readonly importId = input.required<string>();
  /** Conflicts the preview found; the server counts again at commit. */
  readonly expectedConflicts = input(0);
  readonly committed = output<CommitResult>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    replaceConflicts: [false],
    reason: ['', [Validators.maxLength(2000)]],
  });
  private readonly formValue = toSignal(this.form.valueChanges.pipe(startWith(this.form.getRawValue())), {
    initialValue: this.form.getRawValue(),
  });
  protected readonly replacing = computed(() => this.formValue().replaceConflicts === true);

  /** Conflicts the server reported on the last attempt (409), or null before any. */
  protected readonly serverConflicts = signal<number | null>(null);
  protected readonly conflicts = computed(() => this.serverConflicts() ?? this.expectedConflicts());
  protected readonly committing = signal(false);
  protected readonly progress = signal<ImportProgress | null>(null);
  protected readonly progressPercent = computed(() => progressPercent(this.progress()));
  protected readonly error = signal<string | null>(null);
  protected readonly progressText = computed(() => progressText(this.progress()));
  protected readonly fieldError = fieldError;
  private running: Subscription | null = null;

  constructor() {
    this.destroyRef.onDestroy(() => this.running?.unsubscribe());
  }

  protected commit(): void {
    if (this.committing()) return;
    const { replaceConflicts, reason } = this.form.getRawValue();
    const body: CommitBody = {};
    if (this.conflicts() > 0 && replaceConflicts) {
      if (reason.trim().length < 3) {
        this.form.controls.reason.setErrors({ message: 'Say why the stored values are replaced, in a few words' });
        this.form.controls.reason.markAsTouched();
        return;
      }
      body.replaceConflicts = true;
      body.reason = reason.trim();
    }
    this.error.set(null);
    this.progress.set(null);
    this.committing.set(true);
    const importId = this.importId();
    this.running = withProgressPolling(
      this.api.commit(importId, body, handledByCaller()),
      () => this.api.progress(importId, handledByCaller()),
      (progress) => this.progress.set(progress),
      this.pollIntervalMs,
    ).subscribe({
      next: (result) => {
        this.committing.set(false);
        this.committed.emit(result);
      },
      error: (error: unknown) => {
        this.committing.set(false);
        if (error instanceof HttpErrorResponse && error.status === 409 && apiErrorCode(error) === 'conflicts') {
          this.serverConflicts.set(conflictCount(error) ?? Math.max(1, this.expectedConflicts()));
          this.form.controls.replaceConflicts.setValue(false);
          this.error.set(null);
          return;
        }
        this.error.set(error instanceof HttpErrorResponse ? apiErrorMessage(error) : 'The import could not be committed.');
      },
    });
  }
}

function conflictCount(error: HttpErrorResponse): number | null {
  const details = (error.error as { error?: { details?: { conflicts?: unknown } } } | null)?.error?.details;
  return typeof details?.conflicts === 'number' ? details.conflicts : null;
}
