import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatTooltipModule } from '@angular/material/tooltip';

/**
 * The edit and archive buttons at the end of a table row, named for screen readers by what the
 * row holds ("Edit channel NOx (as NO2) dry basis").
 */
@Component({
  selector: 'fl-row-actions',
  imports: [MatButtonModule, MatIconModule, MatTooltipModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <button mat-icon-button type="button" [attr.aria-label]="'Edit ' + entity() + ' ' + name()" matTooltip="Edit" (click)="edit.emit()">
      <mat-icon>edit</mat-icon>
    </button>
    <button
      mat-icon-button
      type="button"
      [attr.aria-label]="'Archive ' + entity() + ' ' + name()"
      matTooltip="Archive"
      (click)="archive.emit()"
    >
      <mat-icon>archive</mat-icon>
    </button>
  `,
})
export class RowActions {
  /** What a row is, in words: "channel", "limit". */
  readonly entity = input.required<string>();
  /** Which one this row is. */
  readonly name = input.required<string>();
  readonly edit = output<void>();
  readonly archive = output<void>();
}
