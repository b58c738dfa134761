import { Injectable, inject, signal } from '@angular/core';
import { AbstractControl } from '@angular/forms';
import { MatSnackBar } from '@angular/material/snack-bar';
import { Router } from '@angular/router';
import { Observable, firstValueFrom } from 'rxjs';

import { canEditSetup } from './can-edit-setup';
import { classifySaveError } from './form-errors';
import { LoadStatus } from './load-state';

/**
 * What every set-up editor keeps around the one record it shows: whether it has loaded, whether
 * a save is running, and whether a save met a newer version someone else stored (HTTP 409
 * `stale_version`, shown by `<fl-conflict-notice>`). Provide it on the editor component
 * (`providers: [RecordEditor]`), so each page and dialog has its own.
 */
@Injectable()
export class RecordEditor {
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);

  readonly canEdit = canEditSetup();
  readonly status = signal<LoadStatus>('loading');
  readonly saving = signal(false);
  readonly conflict = signal(false);

  /** Fetches the record: 'ready', with any conflict cleared, once `fetch` resolves; 'failed' if it throws. */
  async load(fetch: () => Promise<void>): Promise<void> {
    this.status.set('loading');
    try {
      await fetch();
      this.conflict.set(false);
      this.status.set('ready');
    } catch {
      this.status.set('failed');
    }
  }

  /**
   * Runs `write` when the form is valid, otherwise shows every field's problem. A refused save
   * puts the API's field messages beside the fields; a stale version raises the conflict notice.
   */
  async save(form: AbstractControl, write: () => Promise<void>): Promise<void> {
    if (form.invalid) {
      form.markAllAsTouched();
      return;
    }
    this.saving.set(true);
    try {
      await write();
    } catch (error) {
      if (classifySaveError(error, form) === 'stale') this.conflict.set(true);
    } finally {
      this.saving.set(false);
    }
  }

  /**
   * Archives the record (`request` carries its version), says so and returns to the site page.
   * The API keeps the record's history; a stale version raises the conflict notice instead.
   */
  async archive(request: Observable<unknown>, form: AbstractControl, message: string, siteId: string): Promise<void> {
    try {
      await firstValueFrom(request);
      form.markAsPristine();
      this.notify(message);
      await this.router.navigate(['/sites', siteId]);
    } catch (error) {
      if (classifySaveError(error) === 'stale') this.conflict.set(true);
    }
  }

  /** Whether leaving now would lose typing: the person may edit, changed the form and is not saving it. */
  hasUnsavedChanges(form: AbstractControl): boolean {
    return this.canEdit() && form.dirty && !this.saving();
  }

  /** A short confirmation at the bottom of the screen. */
  notify(message: string, durationMs = 5000): void {
    this.snackBar.open(message, 'Close', { duration: durationMs });
  }
}
