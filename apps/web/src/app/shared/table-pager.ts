import { ChangeDetectionStrategy, Component, input } from '@angular/core';
import { MatPaginatorModule } from '@angular/material/paginator';

import { ClientTable } from './client-table';

/** The paginator under a table whose rows a `ClientTable` holds. */
@Component({
  selector: 'fl-table-pager',
  imports: [MatPaginatorModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    <mat-paginator
      [length]="table().total()"
      [pageIndex]="table().pageIndex()"
      [pageSize]="table().pageSize()"
      [pageSizeOptions]="table().pageSizeOptions"
      (page)="table().onPage($event)"
      [attr.aria-label]="label()"
    />
  `,
})
export class TablePager {
  readonly table = input.required<Pick<ClientTable<unknown>, 'total' | 'pageIndex' | 'pageSize' | 'pageSizeOptions' | 'onPage'>>();
  /** e.g. "Channel pages". */
  readonly label = input.required<string>();
}
