import { ChangeDetectionStrategy, Component, Injector, afterNextRender, inject } from '@angular/core';
import { takeUntilDestroyed } from '@angular/core/rxjs-interop';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { NavigationEnd, Router, RouterOutlet } from '@angular/router';
import { filter, skip } from 'rxjs';

import { Loading } from './core/loading/loading';

@Component({
  selector: 'fl-root',
  imports: [RouterOutlet, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <a class="skip-link" href="#main-content" (click)="skipToContent($event)">Skip to content</a>
    @if (loading.active()) {
      <mat-progress-bar class="global-progress" mode="indeterminate" aria-label="Loading" />
    }
    <router-outlet />
  `,
  styles: `
    .global-progress {
      position: fixed;
      inset: 0 0 auto 0;
      z-index: 1100;
    }
  `,
})
export class App {
  protected readonly loading = inject(Loading);
  private readonly injector = inject(Injector);

  constructor() {
    // After each in-app navigation (not the first page load), move focus to the new page's
    // main region so keyboard and screen-reader users start there, unless the page has
    // already placed focus inside it (the sign-in form focuses its e-mail field).
    inject(Router)
      .events.pipe(
        filter((event) => event instanceof NavigationEnd),
        skip(1),
        takeUntilDestroyed(),
      )
      .subscribe(() =>
        afterNextRender(
          () => {
            const main = document.getElementById('main-content');
            if (main && !main.contains(document.activeElement)) main.focus();
          },
          { injector: this.injector },
        ),
      );
  }

  /** A plain `#fragment` link would make the router navigate to "/"; move focus instead. */
  protected skipToContent(event: Event): void {
    event.preventDefault();
    const main = document.getElementById('main-content');
    main?.focus();
    main?.scrollIntoView();
  }
}
