import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule } from '@angular/material/dialog';
import { CanDeactivateFn } from '@angular/router';
import { map } from 'rxjs';

/** A page with a form that may hold changes not yet saved. */
export interface HasUnsavedChanges {
  hasUnsavedChanges(): boolean;
}

@Component({
  selector: 'fl-discard-changes-dialog',
  imports: [MatDialogModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <h2 mat-dialog-title>Leave without saving?</h2>
    <mat-dialog-content>{{ text }}</mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false" cdkFocusInitial>Stay on this page</button>
      <button mat-flat-button type="button" [mat-dialog-close]="true">Discard changes</button>
    </mat-dialog-actions>
  `,
})
export class DiscardChangesDialog {
  protected readonly text =
    inject<string | null>(MAT_DIALOG_DATA, { optional: true }) ?? 'You have changes on this page that are not saved yet.';
}

/** Asks before leaving a page whose form has unsaved changes. */
export const unsavedChangesGuard: CanDeactivateFn<HasUnsavedChanges> = (component) => {
  if (!component?.hasUnsavedChanges()) return true;
  return inject(MatDialog)
    .open<DiscardChangesDialog, string | null, boolean>(DiscardChangesDialog, { data: null, autoFocus: 'dialog' })
    .afterClosed()
    .pipe(map((leave) => leave === true));
};

/** For a page's `(window:beforeunload)` host listener: the browser asks before a reload or close. */
export function warnBeforeUnload(event: BeforeUnloadEvent, dirty: boolean): void {
  if (!dirty) return;
  event.preventDefault();
  // Older browsers show the prompt only when returnValue is set.
  event.returnValue = '';
}
