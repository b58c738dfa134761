import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/** Where a page is with fetching what it shows. */
export type LoadStatus = 'loading' | 'ready' | 'failed';

/** Says that a page is loading, or that it could not load; shows nothing once it is ready. */
@Component({
  selector: 'fl-load-state',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @switch (status()) {
      @case ('loading') {
        <p class="empty-state" role="status">{{ loadingText() }}</p>
      }
      @case ('failed') {
        <p class="empty-state" role="status">{{ failedText() || 'The ' + entity() + ' could not be loaded.' }}</p>
      }
    }
  `,
})
export class LoadState {
  readonly status = input.required<LoadStatus>();
  /** What is loaded, in words: "stack", "emission unit" … */
  readonly entity = input('');
  readonly loadingText = input('Loading…');
  /** Replaces "The {entity} could not be loaded." */
  readonly failedText = input('');
}
