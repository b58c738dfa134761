import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { RouterLink } from '@angular/router';

/**
 * The top of a set-up page: the way back (Sites › the site), the page's heading and, projected
 * beside it, the page's commands.
 */
@Component({
  selector: 'fl-page-header',
  imports: [RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @if (breadcrumb()) {
      <p class="breadcrumb">
        <a routerLink="/sites">Sites</a>
        @if (site(); as site) {
          › <a [routerLink]="['/sites', site.id]">{{ site.name }}</a>
        }
      </p>
    }
    <div class="heading">
      @if (heading()) {
        <h1>{{ heading() }}</h1>
      }
      <ng-content />
    </div>
  `,
  styles: `
    :host {
      display: block;
    }
    .breadcrumb {
      margin: 0 0 8px;
      font: var(--mat-sys-body-medium);

      a {
        color: var(--mat-sys-primary);
      }
    }
    .heading {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
      align-items: center;
      justify-content: space-between;
      margin-bottom: 16px;
    }
    h1 {
      margin: 0;
    }
  `,
})
export class PageHeader {
  readonly heading = input.required<string>();
  /** The site the page belongs to, linked after "Sites"; none on the site's own page. */
  readonly site = input<{ id: string; name: string } | null>(null);
  /** False on the list of sites, which is the start of the way. */
  readonly breadcrumb = input(true);
}
