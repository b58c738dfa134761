import { ChangeDetectionStrategy, Component, input } from '@angular/core';

export interface ReadOnlyField {
  label: string;
  value: string;
}

/** A record shown as label/value pairs, for people who may read but not change it. */
@Component({
  selector: 'fl-read-only-fields',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <dl class="fields">
      @for (field of fields(); track field.label) {
        <div class="field">
          <dt>{{ field.label }}</dt>
          <dd>{{ field.value || '—' }}</dd>
        </div>
      }
    </dl>
  `,
  styles: `
    .fields {
      display: grid;
      grid-template-columns: repeat(auto-fill, minmax(220px, 1fr));
      gap: 12px 24px;
      margin: 0 0 16px;
    }
    dt {
      font: var(--mat-sys-label-medium);
      color: var(--mat-sys-on-surface-variant);
    }
    dd {
      margin: 2px 0 0;
      font: var(--mat-sys-body-large);
    }
  `,
})
export class ReadOnlyFields {
  readonly fields = input.required<readonly ReadOnlyField[]>();
}
