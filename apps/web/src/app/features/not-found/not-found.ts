import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

import { Auth } from '../../core/auth/auth';

@Component({
  selector: 'fl-not-found',
  imports: [MatButtonModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <main id="main-content" tabindex="-1" class="not-found">
      <p class="code" aria-hidden="true">404</p>
      <h1>Page not found</h1>
      <p>There is no page at this address. It may have moved, or the link may be mistyped.</p>
      @if (signedIn()) {
        <a mat-flat-button routerLink="/overview">Go to the overview</a>
      } @else {
        <a mat-flat-button routerLink="/sign-in">Go to sign-in</a>
      }
    </main>
  `,
  styles: `
    .not-found {
      display: grid;
      justify-items: center;
      gap: 8px;
      padding: 64px 24px;
      text-align: center;
      outline: none;
    }
    .code {
      margin: 0;
      font: var(--mat-sys-display-large);
      color: var(--mat-sys-primary);
    }
    h1 {
      margin: 0;
      font: var(--mat-sys-headline-medium);
    }
  `,
})
export class NotFound {
  protected readonly signedIn = inject(Auth).signedIn;
}
