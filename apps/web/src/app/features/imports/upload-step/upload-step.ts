import { HttpErrorResponse, HttpEventType } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, input, output, signal } from '@angular/core';
import { ReactiveFormsModule, NonNullableFormBuilder } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { Subscription } from 'rxjs';

import { apiErrorMessage } from '../../../core/api/api-error';
import { ImportDraft, ImportsApi } from '../../../core/api/imports-api';

/** The API refuses larger files with 413 (contract: ≤ 50 MB); checking first spares the wait. */
export const MAX_IMPORT_FILE_BYTES = 50 * 1024 * 1024;

const acceptedExtensions = ['.xlsx', '.csv'];

/** Step 1: choose the data logger's export and upload it, with the upload's progress. */
@Component({
  selector: 'fl-upload-step',
  imports: [ReactiveFormsModule, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule],
  templateUrl: './upload-step.html',
  styleUrl: './upload-step.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class UploadStep {
  private readonly api = inject(ImportsApi);
  private readonly destroyRef = inject(DestroyRef);

  readonly stackId = input.required<string>();
  readonly uploaded = output<ImportDraft>();

  protected readonly form = inject(NonNullableFormBuilder).group({
    periodFrom: [''],
    periodTo: [''],
  });

  protected readonly file = signal<File | null>(null);
  protected readonly fileError = signal<string | null>(null);
  protected readonly phase = signal<'idle' | 'uploading' | 'processing'>('idle');
  protected readonly uploadPercent = signal(0);
  protected readonly error = signal<string | null>(null);
  protected readonly busy = computed(() => this.phase() !== 'idle');
  private running: Subscription | null = null;

  constructor() {
    this.destroyRef.onDestroy(() => this.running?.unsubscribe());
  }

  protected onFileChosen(event: Event): void {
    const chosen = (event.target as HTMLInputElement).files?.[0] ?? null;
    this.error.set(null);
    this.fileError.set(chosen ? fileProblem(chosen) : null);
    this.file.set(chosen);
  }

  protected upload(): void {
    const file = this.file();
    if (!file || this.fileError() || this.busy()) return;
    const { periodFrom, periodTo } = this.form.getRawValue();
    if (periodFrom && periodTo && periodTo < periodFrom) {
      this.error.set('The end of the period must not be before its start.');
      return;
    }
    this.error.set(null);
    this.uploadPercent.set(0);
    this.phase.set('uploading');
    this.running = this.api
      .upload(this.stackId(), file, { periodFrom: periodFrom || undefined, periodTo: periodTo || undefined })
      .subscribe({
        next: (event) => {
          if (event.type === HttpEventType.UploadProgress) {
            const total = event.total ?? file.size;
            this.uploadPercent.set(total > 0 ? Math.min(100, Math.round((event.loaded / total) * 100)) : 0);
            // All bytes sent: the server now reads and checks the file before it answers.
            if (total > 0 && event.loaded >= total) this.phase.set('processing');
          } else if (event.type === HttpEventType.Response && event.body) {
            this.phase.set('idle');
            this.uploaded.emit(event.body);
          }
        },
        error: (error: unknown) => {
          this.phase.set('idle');
          this.error.set(error instanceof HttpErrorResponse ? apiErrorMessage(error) : 'The upload failed.');
        },
      });
  }

  protected cancel(): void {
    this.running?.unsubscribe();
    this.running = null;
    this.phase.set('idle');
  }
}

function fileProblem(file: File): string | null {
  const name = file.name.toLowerCase();
  if (!acceptedExtensions.some((extension) => name.endsWith(extension))) {
    return 'Choose an Excel workbook (.xlsx) or a CSV file (.csv).';
  }
  if (file.size > MAX_IMPORT_FILE_BYTES) return 'The file is larger than 50 MB, the most one import takes.';
  if (file.size === 0) return 'The file is empty.';
  return null;
}
