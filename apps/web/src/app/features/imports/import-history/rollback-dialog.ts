import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { NonNullableFormBuilder, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule, MatDialogRef } from '@angular/material/dialog';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';

import { fieldError } from '../../../shared/form-errors';

export interface RollbackDialogData {
  fileName: string;
}

/** Asks for the reason a whole import is withdrawn; the dialog closes with that reason, or nothing. */
@Component({
  selector: 'fl-rollback-dialog',
  imports: [ReactiveFormsModule, MatButtonModule, MatDialogModule, MatFormFieldModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>Roll back this import?</h2>
    <form [formGroup]="form" (ngSubmit)="confirm()">
      <mat-dialog-content>
        <p>
          Every reading that {{ data.fileName }} brought is withdrawn (kept on record as superseded) and any values it
          replaced become current again. Hourly values are recalculated.
        </p>
        <mat-form-field appearance="outline" class="reason">
          <mat-label>Reason for the rollback</mat-label>
          <textarea matInput formControlName="reason" rows="3" required cdkFocusInitial></textarea>
          <mat-error>{{ fieldError(form.controls.reason) }}</mat-error>
        </mat-form-field>
      </mat-dialog-content>
      <mat-dialog-actions align="end">
        <button mat-button type="button" mat-dialog-close>Keep the import</button>
        <button mat-flat-button type="submit">Roll back import</button>
      </mat-dialog-actions>
    </form>
  `,
  styles: `
    .reason {
      width: 100%;
      min-width: min(440px, 70vw);
    }
  `,
})
export class RollbackDialog {
  protected readonly data = inject<RollbackDialogData>(MAT_DIALOG_DATA);
  private readonly dialogRef = inject<MatDialogRef<RollbackDialog, string>>(MatDialogRef);
  protected readonly fieldError = fieldError;

  protected readonly form = inject(NonNullableFormBuilder).group({
    reason: ['', [Validators.required, Validators.maxLength(2000), (c: { value: string }) => (c.value.trim().length >= 3 || !c.value ? null : { message: 'Say why, in a few words' })]],
  });

  protected confirm(): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.dialogRef.close(this.form.controls.reason.value.trim());
  }
}
