import { ChangeDetectionStrategy, Component, effect, inject, input, output, signal } from '@angular/core';
import { takeUntilDestroyed, toObservable } from '@angular/core/rxjs-interop';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectChange, MatSelectModule } from '@angular/material/select';
import { EMPTY, catchError, map, of, switchMap } from 'rxjs';

import { Site, SitesApi, StackWithChannels } from '../../core/api/sites-api';

/**
 * Site, then stack: the two choices every data page starts with. It emits the chosen stack; the
 * page puts it in its URL, so a link or a reload opens the same stack.
 */
@Component({
  selector: 'fl-stack-picker',
  imports: [MatFormFieldModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <div class="picker">
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Site</mat-label>
        <mat-select [value]="siteIdChosen()" (selectionChange)="chooseSite($event)">
          @for (site of sites(); track site.id) {
            <mat-option [value]="site.id">{{ site.name }}</mat-option>
          } @empty {
            <mat-option disabled>No sites yet</mat-option>
          }
        </mat-select>
      </mat-form-field>
      <mat-form-field appearance="outline" subscriptSizing="dynamic">
        <mat-label>Stack</mat-label>
        <mat-select [value]="stackId()" [disabled]="!siteIdChosen()" (selectionChange)="chooseStack($event)">
          @for (stack of stacks(); track stack.id) {
            <mat-option [value]="stack.id">{{ stack.name }}</mat-option>
          } @empty {
            <mat-option disabled>This site has no stacks</mat-option>
          }
        </mat-select>
      </mat-form-field>
    </div>
  `,
  styles: `
    .picker {
      display: flex;
      flex-wrap: wrap;
      gap: 12px;
    }
    mat-form-field {
      min-width: 240px;
    }
  `,
})
export class StackPicker {
  private readonly sitesApi = inject(SitesApi);

  /** The stack open now, if any, and its site. */
  readonly siteId = input<string | null>(null);
  readonly stackId = input<string | null>(null);
  readonly stackChange = output<string>();

  protected readonly sites = signal<Site[]>([]);
  protected readonly stacks = signal<StackWithChannels[]>([]);
  protected readonly siteIdChosen = signal<string | null>(null);

  constructor() {
    this.sitesApi
      .listSites({ limit: 100 })
      .pipe(
        catchError(() => EMPTY),
        takeUntilDestroyed(),
      )
      .subscribe((page) => {
        this.sites.set(page.items);
        // With one site there is nothing to choose.
        if (!this.siteIdChosen() && page.items.length === 1) this.siteIdChosen.set(page.items[0].id);
      });

    effect(() => {
      const siteId = this.siteId();
      if (siteId) this.siteIdChosen.set(siteId);
    });

    toObservable(this.siteIdChosen)
      .pipe(
        switchMap((siteId) =>
          siteId
            ? this.sitesApi.getSite(siteId).pipe(
                map((site) => site.stacks.filter((stack) => !stack.archivedAt)),
                catchError(() => of([])),
              )
            : of([]),
        ),
        takeUntilDestroyed(),
      )
      .subscribe((stacks) => this.stacks.set(stacks));
  }

  protected chooseSite(event: MatSelectChange): void {
    this.siteIdChosen.set(event.value as string);
  }

  protected chooseStack(event: MatSelectChange): void {
    this.stackChange.emit(event.value as string);
  }
}
