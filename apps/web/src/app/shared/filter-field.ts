import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';

/** The search box above a table: reports each keystroke's text. */
@Component({
  selector: 'fl-filter-field',
  imports: [MatFormFieldModule, MatIconModule, MatInputModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <mat-form-field appearance="outline" subscriptSizing="dynamic">
      <mat-label>{{ label() }}</mat-label>
      <mat-icon matPrefix aria-hidden="true">search</mat-icon>
      <input matInput [value]="value()" (input)="changed($event)" [placeholder]="placeholder()" />
    </mat-form-field>
  `,
  styles: `
    :host {
      display: block;
      margin-bottom: 16px;
    }
    mat-form-field {
      width: min(100%, 360px);
    }
  `,
})
export class FilterField {
  /** e.g. "Filter channels". */
  readonly label = input.required<string>();
  readonly value = input('');
  readonly placeholder = input('');
  readonly valueChange = output<string>();

  protected changed(event: Event): void {
    this.valueChange.emit((event.target as HTMLInputElement).value);
  }
}
