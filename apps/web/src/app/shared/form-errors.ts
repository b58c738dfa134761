import { HttpErrorResponse } from '@angular/common/http';
import { AbstractControl } from '@angular/forms';

import { apiErrorCode } from '../core/api/api-error';

/**
 * The first problem of a control as a sentence for its mat-error. Validators that carry their
 * own message (`{ message: '…' }` or a string) are shown as they are; `server` holds what the
 * API said about the field.
 */
export function fieldError(control: AbstractControl | null | undefined): string {
  const errors = control?.errors;
  if (!errors) return '';
  if (errors['required']) return 'Required';
  if (errors['server']) return String(errors['server']);
  if (errors['min']) return `Must be at least ${(errors['min'] as { min: number }).min}`;
  if (errors['max']) return `Must be at most ${(errors['max'] as { max: number }).max}`;
  if (errors['maxlength']) return `At most ${(errors['maxlength'] as { requiredLength: number }).requiredLength} characters`;
  if (errors['pattern']) return 'Not in the expected form';
  for (const value of Object.values(errors)) {
    if (typeof value === 'string') return value;
    if (value && typeof value === 'object' && typeof (value as { message?: unknown }).message === 'string') {
      return (value as { message: string }).message;
    }
  }
  return 'Check this value';
}

interface FieldDetail {
  path: string;
  message: string;
}

function fieldDetails(error: HttpErrorResponse): FieldDetail[] {
  const details = (error.error as { error?: { details?: unknown } } | null)?.error?.details;
  if (!Array.isArray(details)) return [];
  return details.filter(
    (d): d is FieldDetail => typeof d === 'object' && d !== null && typeof d.path === 'string' && typeof d.message === 'string',
  );
}

/** What kind of failure a save ran into. */
export type SaveFailure = 'stale' | 'invalid' | 'other';

/**
 * Sorts a failed save and puts the API's field messages (400/422 `details`) onto the matching
 * controls of `form`, so they show inline beside the field. The global error interceptor has
 * already shown the envelope's message.
 */
export function classifySaveError(error: unknown, form?: AbstractControl): SaveFailure {
  if (!(error instanceof HttpErrorResponse)) return 'other';
  if (error.status === 409 && apiErrorCode(error) === 'stale_version') return 'stale';
  if ((error.status === 400 || error.status === 422) && form) {
    for (const detail of fieldDetails(error)) {
      const control = form.get(detail.path);
      if (control) {
        control.setErrors({ ...(control.errors ?? {}), server: detail.message });
        control.markAsTouched();
      }
    }
    return 'invalid';
  }
  return 'other';
}
