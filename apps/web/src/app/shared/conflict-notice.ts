import { ChangeDetectionStrategy, Component, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';

/** Shown when a save was refused because someone else changed the record first (HTTP 409). */
@Component({
  selector: 'fl-conflict-notice',
  imports: [MatButtonModule, MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="notice" role="alert">
      <mat-icon aria-hidden="true">sync_problem</mat-icon>
      <span class="text">
        Someone else changed this {{ entity() }} since you opened it. Reload to see their version, then
        make your change again.
      </span>
      <button mat-flat-button type="button" (click)="reload.emit()">Reload</button>
    </div>
  `,
  styles: `
    .notice {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
      align-items: center;
      margin: 0 0 16px;
      padding: 12px 16px;
      border-radius: 8px;
      background: var(--mat-sys-error-container);
      color: var(--mat-sys-on-error-container);
    }
    .text {
      flex: 1 1 300px;
    }
  `,
})
export class ConflictNotice {
  /** What was changed, in words: "stack", "permit" … */
  readonly entity = input.required<string>();
  readonly reload = output<void>();
}
