import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

/**
 * The buttons under a set-up form: "Create stack" or "Save stack", the way back, and "Archive
 * stack" for a stored record. Place it inside the `<form>`: its first button submits it.
 */
@Component({
  selector: 'fl-form-actions',
  imports: [MatButtonModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <button mat-flat-button type="submit" [disabled]="saving()">{{ (stored() ? 'Save ' : 'Create ') + entity() }}</button>
    <a mat-button [routerLink]="back()">{{ backLabel() }}</a>
    @if (stored() && archivable()) {
      <button mat-button type="button" class="archive" (click)="archive.emit()">Archive {{ entity() }}</button>
    }
  `,
  styles: `
    :host {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
      margin: 8px 0 24px;
    }
    .archive {
      margin-inline-start: auto;
      color: var(--mat-sys-error);
    }
  `,
})
export class FormActions {
  /** What the form holds, in words: "stack", "emission unit" … */
  readonly entity = input.required<string>();
  /** The record exists already (save it) rather than being new (create it). */
  readonly stored = input.required<boolean>();
  readonly saving = input(false);
  readonly back = input.required<readonly unknown[]>();
  readonly backLabel = input('Cancel');
  readonly archivable = input(true);
  readonly archive = output<void>();
}
