import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatIconModule } from '@angular/material/icon';

/** The caution every calculated figure carries (DESIGN.md §6). */
@Component({
  selector: 'fl-calc-caution',
  imports: [MatIconModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <p class="caution" role="note">
      <mat-icon aria-hidden="true">info</mat-icon>
      <span>
        Calculated figures support, and do not replace, the permit, your regulatory reporting and the
        judgement of licensed professionals. Where they differ, the permit and local regulations decide.
      </span>
    </p>
  `,
  styles: `
    .caution {
      display: flex;
      gap: 8px;
      align-items: flex-start;
      margin: 12px 0 0;
      padding: 8px 12px;
      border-radius: 8px;
      background: var(--mat-sys-surface-container);
      color: var(--mat-sys-on-surface-variant);
      font: var(--mat-sys-body-small);
    }
    mat-icon {
      flex: none;
      font-size: 18px;
      width: 18px;
      height: 18px;
    }
  `,
})
export class CalcCaution {}
