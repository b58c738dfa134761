import { Signal, computed, signal } from '@angular/core';
import { PageEvent } from '@angular/material/paginator';
import { Sort } from '@angular/material/sort';

export interface ClientTableOptions<T> {
  /** The rows, all of them (the set-up lists of one site are small enough to hold). */
  rows: Signal<readonly T[]>;
  /** The filter text in force; a row matches when its `text` contains it, ignoring case. */
  filter: Signal<string>;
  text: (row: T) => string;
  /** The value a column sorts by. */
  sortValue: (row: T, column: string) => string | number | null;
  initialSort?: Sort;
  pageSize?: number;
}

/**
 * Filter, sort and page held in signals for a mat-table fed with an array: bind `page()` as
 * the data source, `onSort` to matSortChange and `onPage` to the paginator's page event.
 */
export class ClientTable<T> {
  readonly sort: ReturnType<typeof signal<Sort>>;
  readonly pageIndex = signal(0);
  readonly pageSize: ReturnType<typeof signal<number>>;
  readonly pageSizeOptions = [10, 25, 50];

  readonly filtered: Signal<T[]>;
  readonly sorted: Signal<T[]>;
  readonly page: Signal<T[]>;
  readonly total: Signal<number>;

  constructor(private readonly options: ClientTableOptions<T>) {
    this.sort = signal<Sort>(options.initialSort ?? { active: '', direction: '' });
    this.pageSize = signal(options.pageSize ?? 10);
    this.filtered = computed(() => {
      const needle = options.filter().trim().toLowerCase();
      const rows = [...options.rows()];
      return needle ? rows.filter((row) => options.text(row).toLowerCase().includes(needle)) : rows;
    });
    this.sorted = computed(() => {
      const { active, direction } = this.sort();
      const rows = [...this.filtered()];
      if (!active || !direction) return rows;
      const sign = direction === 'asc' ? 1 : -1;
      return rows.sort((a, b) => compareValues(options.sortValue(a, active), options.sortValue(b, active)) * sign);
    });
    this.total = computed(() => this.filtered().length);
    this.page = computed(() => {
      // A filter that shrinks the list must not leave the person on a page past its end.
      const size = this.pageSize();
      const lastPage = Math.max(0, Math.ceil(this.total() / size) - 1);
      const index = Math.min(this.pageIndex(), lastPage);
      return this.sorted().slice(index * size, index * size + size);
    });
  }

  onSort(sort: Sort): void {
    this.sort.set(sort);
    this.pageIndex.set(0);
  }

  onPage(event: PageEvent): void {
    this.pageSize.set(event.pageSize);
    this.pageIndex.set(event.pageIndex);
  }
}

function compareValues(a: string | number | null, b: string | number | null): number {
  if (a === b) return 0;
  if (a === null) return 1;
  if (b === null) return -1;
  if (typeof a === 'number' && typeof b === 'number') return a - b;
  return String(a).localeCompare(String(b), undefined, { sensitivity: 'base', numeric: true });
}
